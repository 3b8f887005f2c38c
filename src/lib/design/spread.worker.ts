/**
 * Monte Carlo worker: runs the engine's spread in chunks (createSpreadRun), posts progress
 * after each chunk and yields to its message queue between chunks so a cancel arrives in
 * time. One run at a time; a new start replaces the old run.
 */
import { createSpreadRun, type SpreadRun } from '$lib/engine/spread/spread';
import { summarise, type FromWorker, type ToWorker } from './spreadProtocol';

// Typed by hand: the project's TypeScript lib is the DOM's, not the worker's.
const ctx = self as unknown as { postMessage(m: FromWorker): void; onmessage: ((e: MessageEvent<ToWorker>) => void) | null };
let current: { runId: number; run: SpreadRun } | null = null;
const post = (m: FromWorker) => ctx.postMessage(m);
/** Samples per chunk: small enough that progress and cancel feel immediate. */
const CHUNK = 100;

ctx.onmessage = (e: MessageEvent<ToWorker>) => {
	const m = e.data;
	if (m.type === 'cancel') {
		if (current && current.runId === m.runId) current.run.cancel();
		return;
	}
	current?.run.cancel();
	let run: SpreadRun;
	try {
		run = createSpreadRun(m.spec, m.config);
	} catch (err) {
		post({ type: 'error', runId: m.runId, message: err instanceof Error ? err.message : String(err) });
		return;
	}
	const mine = { runId: m.runId, run };
	current = mine;
	const t0 = performance.now();
	const tick = () => {
		if (current !== mine) return;
		let finished: boolean;
		try {
			finished = run.step(CHUNK);
		} catch (err) {
			post({ type: 'error', runId: m.runId, message: err instanceof Error ? err.message : String(err) });
			current = null;
			return;
		}
		post({ type: 'progress', runId: m.runId, done: run.done, total: run.total });
		if (finished) {
			post({ type: 'result', runId: m.runId, summary: summarise(run.result()), elapsedMs: performance.now() - t0 });
			current = null;
		} else setTimeout(tick, 0);
	};
	tick();
};
