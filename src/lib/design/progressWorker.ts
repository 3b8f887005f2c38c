// The wiring of a Web Worker that runs one long job at a time with progress: start, progress,
// result, error and cancel, shared by the spread and switching-check panels. Each run has a
// number; an answer from an earlier run (one that was replaced or cancelled) is dropped. Cancel
// comes in two kinds, since the jobs differ: `send` a message the worker checks between steps
// (the spread stops and answers with what it has), or `end` the worker when its job runs in one
// piece (the switching check); the next run then starts a fresh worker.

/** What every such worker answers besides its result. */
export type ProgressMessage = { type: 'progress'; runId: number; done: number; total: number };
export type ErrorMessage = { type: 'error'; runId: number; message: string };

export interface ProgressHandlers<Result> {
	progress(done: number, total: number): void;
	result(message: Result): void;
	error(message: string): void;
}

export interface ProgressWorker<ToWorker> {
	/** Starts run N+1 with the message built for its number (the worker is created on first use). */
	start(message: (runId: number) => ToWorker): void;
	/** Sends the current run a message (a cancel the worker reads between steps); nothing without a worker. */
	send(message: (runId: number) => ToWorker): void;
	/** Ends the worker and whatever it was running; the next start creates a new one. */
	end(): void;
}

/**
 * `create` makes the worker (its URL must stay a literal `new URL(…, import.meta.url)` in the
 * caller for the bundler); `stopped` is the sentence shown when the worker dies without a word.
 */
export function progressWorker<ToWorker, FromWorker extends { type: string; runId: number }>(
	create: () => Worker,
	on: ProgressHandlers<Exclude<FromWorker, ProgressMessage | ErrorMessage>>,
	stopped: string
): ProgressWorker<ToWorker> {
	let worker: Worker | null = null;
	let runId = 0;
	function ensure(): Worker {
		if (worker) return worker;
		const w = create();
		w.onmessage = (e: MessageEvent<FromWorker>) => {
			const m = e.data as FromWorker | ProgressMessage | ErrorMessage;
			if (w !== worker || m.runId !== runId) return;
			if (m.type === 'progress') on.progress((m as ProgressMessage).done, (m as ProgressMessage).total);
			else if (m.type === 'error') on.error((m as ErrorMessage).message);
			else on.result(m as Exclude<FromWorker, ProgressMessage | ErrorMessage>);
		};
		w.onerror = (e) => {
			if (w === worker) on.error(e.message || stopped);
		};
		worker = w;
		return w;
	}
	return {
		start(message) {
			runId += 1;
			ensure().postMessage(message(runId));
		},
		send(message) {
			worker?.postMessage(message(runId));
		},
		end() {
			worker?.terminate();
			worker = null;
		}
	};
}
