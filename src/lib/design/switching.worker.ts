/**
 * Switching-check worker: the switching model of one design (engine switching/, through
 * switchingCheckOfDesign), with a progress message after each measured frequency, then the load
 * step on the switched circuit beside the averaged one.
 */
import { switchingCheckOfDesign, switchingLoadStepOfDesign } from '$lib/engine/pipeline/switchingCircuit';
import type { FromWorker, ToWorker } from './switchingProtocol';

// Typed by hand: the project's TypeScript lib is the DOM's, not the worker's.
const ctx = self as unknown as { postMessage(m: FromWorker): void; onmessage: ((e: MessageEvent<ToWorker>) => void) | null };
const post = (m: FromWorker) => ctx.postMessage(m);

ctx.onmessage = (e: MessageEvent<ToWorker>) => {
	const { runId, document } = e.data;
	const t0 = performance.now();
	try {
		const r = switchingCheckOfDesign(document, { onProgress: (done, total) => post({ type: 'progress', runId, done, total }) });
		if ('error' in r) post({ type: 'error', runId, message: r.error.message });
		else {
			post({ type: 'result', runId, result: r, elapsedMs: performance.now() - t0 });
			// The load step after the result, so the margins show first.
			const step = switchingLoadStepOfDesign(document);
			post({ type: 'step', runId, step: 'error' in step ? { reason: step.error.message } : step });
		}
	} catch (err) {
		post({ type: 'error', runId, message: err instanceof Error ? err.message : String(err) });
	}
};
