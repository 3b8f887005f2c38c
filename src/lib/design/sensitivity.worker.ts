/**
 * Sensitivity worker: d PM, GM, fc per part (engine/sensitivity, two loop analyses per part) off
 * the main thread, asked for once the input settles and the Corners tab is open, so typing never
 * waits for it.
 */
import { z } from 'zod';
import { designDocumentSchema, zodFields } from '$lib/engine';
import { designSensitivity } from '$lib/engine/sensitivity';
import type { FromSensitivity, ToSensitivity } from './sensitivityProtocol';

// As on the page (hooks.client.ts): zod's eval probe would be a Content-Security-Policy violation.
z.config({ jitless: true });

const ctx = self as unknown as { postMessage(m: FromSensitivity): void; onmessage: ((e: MessageEvent<ToSensitivity>) => void) | null };

ctx.onmessage = (e: MessageEvent<ToSensitivity>) => {
	const { id, document } = e.data;
	const parsed = designDocumentSchema.safeParse(document);
	if (!parsed.success) {
		ctx.postMessage({ id, type: 'error', message: Object.entries(zodFields(parsed.error)).map(([k, v]) => `${k} ${v}`).join('; ') });
		return;
	}
	try {
		const report = designSensitivity(parsed.data);
		if ('error' in report) ctx.postMessage({ id, type: 'error', message: report.error.message });
		else ctx.postMessage({ id, type: 'sensitivity', report });
	} catch (err) {
		ctx.postMessage({ id, type: 'error', message: err instanceof Error ? err.message : String(err) });
	}
};
