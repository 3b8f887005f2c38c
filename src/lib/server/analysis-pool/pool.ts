// The analysis pool: engine work off the request thread, in worker threads (tinypool), each task
// with a time budget (the worker is ended when it runs over) and a heap budget (resourceLimits;
// a worker that runs out is ended by V8), both answered 422 analysis-too-costly naming the
// fields to reduce. In front of it, admission: at most `perUser` analyses per user in flight
// (429) and at most `queue` waiting over all users (503), so no user can fill the queue alone.
// Tasks go to tinypool only when a thread is free, and a freed thread goes to the waiting task
// whose user has the fewest tasks on threads (oldest first among equals), not first come first
// served (among users holding as many, the one served longest ago): with four users keeping eight costly documents queued, a fifth user's one analysis waits
// for the next free thread, not behind all eight (the abuse run of scripts/load.ts measured a
// 60 s wait and a 503 with a first-come queue).
import { MessageChannel } from 'node:worker_threads';
import Tinypool from 'tinypool';
import { ApiError } from '../http/errors';
import { costFields } from './costFields';
import type { AnalysisLimits } from './limits';
import type { TaskName, TaskOutput, TaskRequest } from './tasks';

export interface PoolStats {
	threads: number;
	/** Tasks a worker is computing. */
	running: number;
	/** Tasks admitted and waiting for a worker. */
	waiting: number;
}

/** The worker entry to load: the bundled chunk in a build, or the TypeScript source through tsx in development. */
export async function workerFilename(): Promise<string> {
	// A dynamic import, so the bundler emits the entry as a chunk of its own whose URL it knows;
	// naming the default export keeps the bundler from tree-shaking the worker's code away.
	const entry = await import('./worker');
	if (typeof entry.default !== 'function') throw new Error('the analysis worker entry exports no handler');
	return entry.workerUrl.endsWith('.ts') ? new URL('./tsx-worker.mjs', entry.workerUrl).href : entry.workerUrl;
}

export class AnalysisPool {
	readonly limits: AnalysisLimits;
	#pool: Tinypool;
	#perOwner = new Map<string, number>();
	#running = 0;
	#waiting = 0;
	/** Tasks holding a thread (handed to tinypool), per user and in all. */
	#onThreads = new Map<string, number>();
	#held = 0;
	/** When each user with tasks in flight was last given a thread (a counter, not a clock). */
	#lastGranted = new Map<string, number>();
	#grants = 0;
	/** Tasks admitted and waiting for a thread, in arrival order. */
	#forThread: { owner: string; grant: () => void }[] = [];

	constructor(limits: AnalysisLimits, filename: string) {
		this.limits = limits;
		this.#pool = new Tinypool({
			filename,
			minThreads: limits.threads,
			maxThreads: limits.threads,
			// Admission below keeps tinypool's own queue within this; it is only a backstop.
			maxQueue: limits.queue + limits.threads,
			resourceLimits: { maxOldGenerationSizeMb: limits.memoryMb, maxYoungGenerationSizeMb: Math.min(64, Math.max(4, limits.memoryMb / 8)) }
		});
	}

	stats(): PoolStats {
		return { threads: this.limits.threads, running: this.#running, waiting: this.#waiting };
	}

	/**
	 * Runs a task for `owner` (a user id). `document` is the design the fields of a 422 refer to.
	 * Throws ApiError 429 (this user has `perUser` analyses in flight), 503 (the queue is full, or
	 * no worker was free in time) or 422 analysis-too-costly (over the time or memory budget).
	 */
	async run<K extends TaskName>(owner: string, request: TaskRequest<K>, document: unknown): Promise<TaskOutput<K>> {
		const { limits } = this;
		const mine = this.#perOwner.get(owner) ?? 0;
		if (mine >= limits.perUser) {
			throw new ApiError(429, 'too-many-analyses', `you have ${mine} analyses running; wait for one to finish (at most ${limits.perUser} at a time per user)`);
		}
		// Counted when admitted (a task's start is only known a moment later, from its worker).
		if (this.#waiting + this.#running >= limits.threads + limits.queue) {
			throw new ApiError(503, 'analysis-busy', 'every analysis worker is busy and the queue is full; try again in a few seconds', undefined, { retryAfterS: 5 });
		}
		this.#perOwner.set(owner, mine + 1);
		this.#waiting++;
		let state = 'waiting' as 'waiting' | 'running';
		const started = () => {
			state = 'running';
			this.#waiting--;
			this.#running++;
		};
		let holding = false;
		try {
			await this.#thread(owner);
			holding = true;
			// A worker ended under a task that was not stopped for its own budget (tinypool may hand
			// a queued task to a worker that another task's budget is ending): run it again once.
			for (let attempt = 1; ; attempt++) {
				try {
					return await this.#attempt(request, document, started);
				} catch (error) {
					if (!(error instanceof EndedUnderTask) || attempt >= 2) throw error instanceof EndedUnderTask ? error.cause : error;
					if (state === 'running') {
						state = 'waiting';
						this.#running--;
						this.#waiting++;
					}
				}
			}
		} finally {
			if (holding) this.#releaseThread(owner);
			if (state === 'waiting') this.#waiting--;
			else this.#running--;
			const left = (this.#perOwner.get(owner) ?? 1) - 1;
			if (left > 0) this.#perOwner.set(owner, left);
			else {
				this.#perOwner.delete(owner);
				this.#lastGranted.delete(owner);
			}
		}
	}

	/** Resolves when `owner` may hand a task to tinypool; 503 after `queueWaitMs` without a thread. */
	#thread(owner: string): Promise<void> {
		if (this.#held < this.limits.threads && this.#forThread.length === 0) {
			this.#hold(owner);
			return Promise.resolve();
		}
		return new Promise((resolve, reject) => {
			const waiter = {
				owner,
				grant: () => {
					clearTimeout(timer);
					this.#hold(owner);
					resolve();
				}
			};
			const timer = setTimeout(() => {
				this.#forThread.splice(this.#forThread.indexOf(waiter), 1);
				reject(new ApiError(503, 'analysis-busy', `no analysis worker was free within ${this.limits.queueWaitMs / 1000} s; try again shortly`, undefined, { retryAfterS: 5 }));
			}, this.limits.queueWaitMs);
			this.#forThread.push(waiter);
		});
	}

	#hold(owner: string) {
		this.#held++;
		this.#onThreads.set(owner, (this.#onThreads.get(owner) ?? 0) + 1);
		this.#lastGranted.set(owner, ++this.#grants);
	}

	/** Frees `owner`'s thread and grants it to the waiting task whose user holds the fewest threads, then was served longest ago. */
	#releaseThread(owner: string) {
		this.#held--;
		const left = (this.#onThreads.get(owner) ?? 1) - 1;
		if (left > 0) this.#onThreads.set(owner, left);
		else this.#onThreads.delete(owner);
		if (this.#forThread.length === 0) return;
		const onThreads = (o: string) => this.#onThreads.get(o) ?? 0;
		const lastGranted = (o: string) => this.#lastGranted.get(o) ?? 0;
		let best = 0;
		for (let i = 1; i < this.#forThread.length; i++) {
			const [a, b] = [this.#forThread[i].owner, this.#forThread[best].owner];
			if (onThreads(a) < onThreads(b) || (onThreads(a) === onThreads(b) && lastGranted(a) < lastGranted(b))) best = i;
		}
		const [next] = this.#forThread.splice(best, 1);
		next.grant();
	}

	/** One run in a worker: the queue-wait timer until the worker says it started, then the time budget. */
	async #attempt<K extends TaskName>(request: TaskRequest<K>, document: unknown, onStart: () => void): Promise<TaskOutput<K>> {
		const { limits } = this;
		let stoppedFor = null as 'time' | 'queue' | null;
		const abort = new AbortController();
		const { port1, port2 } = new MessageChannel();
		let timer = setTimeout(() => {
			stoppedFor = 'queue';
			abort.abort();
		}, limits.queueWaitMs);
		port1.once('message', () => {
			if (stoppedFor) return;
			onStart();
			clearTimeout(timer);
			timer = setTimeout(() => {
				stoppedFor = 'time';
				abort.abort();
			}, limits.timeLimitMs);
		});
		try {
			return (await this.#pool.run({ request, started: port2 }, { transferList: [port2], signal: abort.signal })) as TaskOutput<K>;
		} catch (error) {
			if (stoppedFor === 'time') {
				throw tooCostly(document, `the analysis ran longer than its ${limits.timeLimitMs / 1000} s budget and was stopped`);
			}
			if (stoppedFor === 'queue') {
				throw new ApiError(503, 'analysis-busy', `no analysis worker was free within ${limits.queueWaitMs / 1000} s; try again shortly`, undefined, { retryAfterS: 5 });
			}
			if ((error as { code?: unknown })?.code === 'ERR_WORKER_OUT_OF_MEMORY') {
				throw tooCostly(document, `the analysis needed more than its ${limits.memoryMb} MB memory budget and was stopped`);
			}
			if (error instanceof Error && error.message === 'Terminating worker thread') throw new EndedUnderTask(error);
			throw error;
		} finally {
			clearTimeout(timer);
			port1.close();
		}
	}

	async destroy(): Promise<void> {
		await this.#pool.destroy();
	}
}

/** tinypool ended the worker a task was on, not for that task's budget. */
class EndedUnderTask extends Error {
	constructor(readonly cause: Error) {
		super(cause.message);
	}
}

function tooCostly(document: unknown, what: string): ApiError {
	return new ApiError(422, 'analysis-too-costly', `${what}; reduce the fields named here`, costFields(document));
}
