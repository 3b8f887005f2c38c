/**
 * A panel's side of a worker that answers only the latest request (latestWorker.ts): asks once
 * per key (the design, with whatever else the answer depends on) and keeps, as state, which key
 * the last answer or failure belongs to, so the panel can mark an answer for an earlier design
 * while the next one runs. The closed-loop section and the sensitivity chart use it.
 */
import { createLatestWorker } from './latestWorker';

export interface LatestAnswer<Key, Req> {
	/** False where there are no workers (the server's render): the panel computes or waits itself. */
	readonly available: boolean;
	/** Sends `message(id)` for `key`, unless `key` is the one asked last. */
	ask(key: Key, message: (id: number) => Req): void;
	/** Whether the last answer (or failure) is the one for `key`. */
	answers(key: Key): boolean;
	dispose(): void;
}

export function latestAnswer<Key, Req, Res extends { id: number }>(options: {
	spawn: () => Worker;
	answer: (message: Res) => void;
	failed: (message: string) => void;
	/** When two keys ask the same (default: the same value). */
	same?: (a: Key, b: Key) => boolean;
}): LatestAnswer<Key, Req> {
	const same = options.same ?? Object.is;
	let answeredFor = $state.raw<{ key: Key } | null>(null);
	let requested: { key: Key } | null = null;
	const worker =
		typeof Worker === 'undefined'
			? null
			: createLatestWorker<Req, Res>(
					options.spawn,
					(m) => {
						answeredFor = requested;
						options.answer(m);
					},
					(message) => {
						answeredFor = requested;
						options.failed(message);
					}
				);
	return {
		available: worker !== null,
		ask(key, message) {
			if (!worker || (requested && same(key, requested.key))) return;
			requested = { key };
			worker.request(message);
		},
		answers: (key) => answeredFor !== null && same(key, answeredFor.key),
		dispose: () => worker?.dispose()
	};
}
