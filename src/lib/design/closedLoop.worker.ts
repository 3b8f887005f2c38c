/**
 * Closed-loop worker: the closed-loop responses and the load and reference steps of the nominal
 * design (closedLoopOf), off the main thread, started once the input settles so that opening the
 * Closed loop or Step tab only paints. Tens of milliseconds of engine work that would otherwise
 * run on the tab's click or delay the next keystroke.
 */
import { z } from 'zod';
import { analyzeDesignDetailed } from '$lib/engine';
import { closedLoopOf } from './robustness';
import type { FromClosedLoop, ToClosedLoop } from './closedLoopProtocol';

// As on the page (hooks.client.ts): zod's eval probe would be a Content-Security-Policy violation.
z.config({ jitless: true });

const ctx = self as unknown as { postMessage(m: FromClosedLoop): void; onmessage: ((e: MessageEvent<ToClosedLoop>) => void) | null };

ctx.onmessage = (e: MessageEvent<ToClosedLoop>) => {
	const { id, document, step } = e.data;
	try {
		const nominal = analyzeDesignDetailed(document, { closedLoop: false, sections: false });
		if ('error' in nominal) ctx.postMessage({ id, type: 'error', message: nominal.error.message });
		else ctx.postMessage({ id, type: 'closed-loop', ...closedLoopOf(nominal, step) });
	} catch (err) {
		ctx.postMessage({ id, type: 'error', message: err instanceof Error ? err.message : String(err) });
	}
};
