// The analysis pool's budgets, read once from the environment (README, "Limits"; .env.example).
// Every analysis the server runs goes through the pool (index.ts), so these bound the CPU time,
// memory and concurrency that any one request, or any one user, can take.
import { availableParallelism } from 'node:os';

export interface AnalysisLimits {
	/** Worker threads running analyses [the core count, at most 4]. */
	threads: number;
	/** Wall time one analysis may run once a worker has started it, ms [20 000]. */
	timeLimitMs: number;
	/** Heap (old generation) of one worker, MB; above it the worker is ended [384]. */
	memoryMb: number;
	/** Analyses one user may have running or waiting at a time; more answer 429 [2]. */
	perUser: number;
	/** Analyses waiting for a worker, over all users; more answer 503 [32]. */
	queue: number;
	/** Longest wait for a worker before the request answers 503, ms [60 000]. */
	queueWaitMs: number;
}

function whole(env: NodeJS.ProcessEnv, name: string, fallback: number, min: number): number {
	const raw = env[name];
	if (raw === undefined || raw === '') return fallback;
	const value = Number(raw);
	if (!Number.isInteger(value) || value < min) throw new Error(`${name} must be a whole number ≥ ${min} (got "${raw}")`);
	return value;
}

export function analysisLimits(env: NodeJS.ProcessEnv = process.env): AnalysisLimits {
	return {
		threads: whole(env, 'ANALYSIS_THREADS', Math.min(4, availableParallelism()), 1),
		timeLimitMs: whole(env, 'ANALYSIS_TIME_LIMIT_MS', 20_000, 1),
		memoryMb: whole(env, 'ANALYSIS_MEMORY_MB', 384, 16),
		perUser: whole(env, 'ANALYSIS_PER_USER', 2, 1),
		queue: whole(env, 'ANALYSIS_QUEUE', 32, 0),
		queueWaitMs: whole(env, 'ANALYSIS_QUEUE_WAIT_MS', 60_000, 1)
	};
}
