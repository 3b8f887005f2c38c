/**
 * Verdict worker: the engine's verifyDesign (corners × tolerances, spread, rules) off the main
 * thread, so typing stays smooth while every corner and spread sample runs.
 */
import { z } from 'zod';
import { designDocumentSchema, verifyValidatedDesignDetailed, zodFields } from '$lib/engine';
import type { FromVerifier, ToVerifier } from './verifyProtocol';

// As on the page (hooks.client.ts): zod's eval probe would be a Content-Security-Policy violation.
z.config({ jitless: true });

// Typed by hand: the project's TypeScript lib is the DOM's, not the worker's.
const ctx = self as unknown as { postMessage(m: FromVerifier): void; onmessage: ((e: MessageEvent<ToVerifier>) => void) | null };

ctx.onmessage = (e: MessageEvent<ToVerifier>) => {
	const m = e.data;
	const t0 = performance.now();
	const parsed = designDocumentSchema.safeParse(m.document);
	if (!parsed.success) {
		ctx.postMessage({ type: 'error', id: m.id, message: Object.entries(zodFields(parsed.error)).map(([k, v]) => `${k} ${v}`).join('; ') });
		return;
	}
	try {
		const r = verifyValidatedDesignDetailed(parsed.data, { traceFreqHz: m.traceFreqHz });
		if ('error' in r) ctx.postMessage({ type: 'error', id: m.id, message: r.error.message });
		else ctx.postMessage({ type: 'verdict', id: m.id, verification: r.verification, corners: r.corners, elapsedMs: performance.now() - t0 });
	} catch (err) {
		ctx.postMessage({ type: 'error', id: m.id, message: err instanceof Error ? err.message : String(err) });
	}
};
