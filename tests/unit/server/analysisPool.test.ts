// The analysis pool (README.md, "Limits"): analyses run in worker threads with a time and a memory budget
// (422 analysis-too-costly naming the fields to reduce, and the pool recovers), at most
// `perUser` in flight per user (429), a bounded queue (503), and the request thread stays free
// while the workers compute. Each pool here gets small, explicit limits.
import { afterEach, describe, expect, it } from 'vitest';
import { analyzeDesign } from '$lib/engine/analyze';
import { AnalysisPool, workerFilename, type AnalysisLimits } from '$lib/server/analysis-pool';
import { ApiError } from '$lib/server/http/errors';
import { buckDesign, worstCaseDesign } from '../../integration/support/designs';

const defaults: AnalysisLimits = { threads: 1, timeLimitMs: 60_000, memoryMb: 384, perUser: 2, queue: 8, queueWaitMs: 120_000 };
let pools: AnalysisPool[] = [];
async function poolWith(limits: Partial<AnalysisLimits>) {
	const p = new AnalysisPool({ ...defaults, ...limits }, await workerFilename());
	pools.push(p);
	return p;
}
afterEach(async () => {
	await Promise.all(pools.map((p) => p.destroy()));
	pools = [];
});

async function refusal(promise: Promise<unknown>): Promise<ApiError> {
	try {
		await promise;
	} catch (e) {
		if (e instanceof ApiError) return e;
		throw e;
	}
	throw new Error('expected the pool to refuse');
}

const analyze = (document: unknown) => ({ name: 'analyze' as const, input: { document } });

describe('analysis pool', { timeout: 180_000 }, () => {
	it('answers what the engine answers in-process', async () => {
		const pool = await poolWith({});
		const remote = await pool.run('u1', analyze(buckDesign()), null);
		const local = analyzeDesign(buckDesign());
		if ('error' in remote || 'error' in local) throw new Error('the test design must analyse');
		expect(remote.metrics).toEqual(local.metrics);
		expect(remote.response.freqHz).toEqual(local.response.freqHz);
		// Field errors come back as data (the API's 400), not as a refusal.
		const bad = await pool.run('u1', analyze({ ...buckDesign(), modulator: { vramp: 1.5, delay: 1 } }), null);
		expect('error' in bad && bad.error.fields['modulator.delay']).toMatch(/switching periods/);
	});

	it('stops an analysis over its time budget with 422 naming the fields to reduce, and keeps serving', async () => {
		// The worst accepted document needs about 2.7 s of CPU here (README records), far over 0.5 s.
		const pool = await poolWith({ timeLimitMs: 500 });
		const doc = worstCaseDesign();
		const e = await refusal(pool.run('u1', analyze(doc), doc));
		expect(e.status).toBe(422);
		expect(e.code).toBe('analysis-too-costly');
		expect(e.message).toMatch(/0\.5 s budget/);
		expect(Object.keys(e.fields ?? {})).toEqual(expect.arrayContaining(['corners.maxCorners', 'spread.samples', 'sweep.points', 'modulator.delay']));
		expect(pool.stats()).toMatchObject({ running: 0, waiting: 0 });
		// The stopped worker was replaced: the pool still answers (a document refused by the
		// schema costs a millisecond).
		const next = await pool.run('u1', analyze({}), null);
		expect('error' in next && next.error.code).toBe('invalid-design');
	});

	it('stops an analysis over its memory budget with 422', async () => {
		// 2000 spread samples, 4096 corners with their traces and 5000-point sections do not fit
		// in a 24 MB heap.
		const pool = await poolWith({ memoryMb: 24 });
		const doc = worstCaseDesign();
		const e = await refusal(pool.run('u1', analyze(doc), doc));
		expect(e.status).toBe(422);
		expect(e.code).toBe('analysis-too-costly');
		expect(e.message).toMatch(/24 MB memory budget/);
	});

	it('allows each user `perUser` analyses in flight (429 beyond), others unaffected', async () => {
		const pool = await poolWith({ perUser: 1, threads: 1 });
		const first = pool.run('alice', analyze(worstCaseDesign()), null);
		const second = await refusal(pool.run('alice', analyze(buckDesign()), null));
		expect(second.status).toBe(429);
		expect(second.code).toBe('too-many-analyses');
		const bob = pool.run('bob', analyze(buckDesign()), null);
		await expect(first).resolves.toBeTruthy();
		await expect(bob).resolves.toBeTruthy();
		// Alice's slot is free again.
		await expect(pool.run('alice', analyze(buckDesign()), null)).resolves.toBeTruthy();
	});

	it('bounds the queue over all users (503 with retry-after)', async () => {
		const pool = await poolWith({ threads: 1, queue: 1 });
		const running = pool.run('a', analyze(worstCaseDesign()), null);
		const waiting = pool.run('b', analyze(buckDesign()), null);
		const refused = await refusal(pool.run('c', analyze(buckDesign()), null));
		expect(refused.status).toBe(503);
		expect(refused.code).toBe('analysis-busy');
		expect(refused.extra?.retryAfterS).toBeGreaterThan(0);
		await Promise.all([running, waiting]);
	});

	it('gives a freed thread to the user served least, not to the oldest waiting task', async () => {
		// [common practice: fair queueing across users] Alice keeps three analyses in flight on a
		// one-thread pool; Bob's one analysis, sent after all of hers, runs as soon as her first ends.
		const pool = await poolWith({ threads: 1, perUser: 3 });
		const finished: string[] = [];
		const job = (who: string, label: string, doc: unknown) => pool.run(who, analyze(doc), null).then(() => finished.push(label));
		const jobs = [job('alice', 'alice-1', worstCaseDesign())];
		while (pool.stats().running === 0) await new Promise((r) => setTimeout(r, 5));
		jobs.push(job('alice', 'alice-2', buckDesign()), job('alice', 'alice-3', buckDesign()));
		jobs.push(job('bob', 'bob-1', buckDesign()));
		expect(pool.stats()).toMatchObject({ running: 1, waiting: 3 });
		await Promise.all(jobs);
		expect(finished).toEqual(['alice-1', 'bob-1', 'alice-2', 'alice-3']);
	});

	it('leaves the calling thread free while the workers compute', async () => {
		const pool = await poolWith({ threads: 1 });
		let done = false;
		const job = pool.run('u1', analyze(worstCaseDesign()), null).then(() => (done = true));
		// Wait until the worker has started it, then see the event loop turn (a timer fires)
		// while it is still computing: an in-process analysis would hold the thread until done.
		while (pool.stats().running === 0) await new Promise((r) => setTimeout(r, 5));
		await new Promise((r) => setTimeout(r, 1));
		expect(pool.stats().running).toBe(1);
		expect(done).toBe(false);
		await job;
		expect(done).toBe(true);
	});
});
