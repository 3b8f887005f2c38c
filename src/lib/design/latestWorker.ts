/**
 * A worker that answers only the latest request: a request made while the worker is still busy
 * with an older one ends that worker and starts a fresh one, so the answer delivered is always
 * the current design's and a stale run never keeps a core busy. Answers carry the request's id;
 * one for an older id is dropped. The verdict and the closed-loop section use it.
 */
export interface LatestWorker<Req> {
	/** Sends `message(id)` and forgets every earlier request. */
	request(message: (id: number) => Req): void;
	dispose(): void;
}

export function createLatestWorker<Req, Res extends { id: number }>(
	spawn: () => Worker,
	onAnswer: (answer: Res) => void,
	onFailure: (message: string) => void
): LatestWorker<Req> {
	let worker: Worker | null = null;
	let busy = false;
	let id = 0;
	const start = () => {
		const w = spawn();
		w.onmessage = (e: MessageEvent<Res>) => {
			busy = false;
			if (e.data.id === id) onAnswer(e.data);
		};
		w.onerror = (e) => {
			busy = false;
			onFailure(e.message || 'The worker stopped.');
		};
		return w;
	};
	return {
		request(message) {
			if (busy && worker) {
				worker.terminate();
				worker = null;
			}
			worker ??= start();
			id += 1;
			busy = true;
			worker.postMessage(message(id));
		},
		dispose() {
			worker?.terminate();
			worker = null;
		}
	};
}
