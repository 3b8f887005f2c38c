// Bounded cost of every analysis (README.md, "Limits"), against the real app: the attacks
// of the issue answer at once with field errors, the costliest accepted documents run in the
// analysis pool's worker threads while the server keeps answering everyone else, and one user
// gets at most two analyses in flight. These assert what the server does, never how fast.
import './support/env';
import { beforeAll, describe, expect, it } from 'vitest';
import { servedApp } from './support/app';
import { signUp, type Client } from './support/client';
import { buckDesign, worstCaseDesign } from './support/designs';
import { createWorkspace } from './support/fixtures';

const app = servedApp();
type User = Client & { email: string; userId: string };
let users: User[] = [];

beforeAll(async () => {
	users = await Promise.all([0, 1, 2, 3, 4].map((i) => signUp(app.origin, `cost${i}`)));
	// Start the pool's workers (the first analysis of a server does) outside the tests below.
	expect((await users[4].post('/api/v1/analyze', buckDesign())).status).toBe(200);
});

const health = (c: Client) => c.get<{ status: string; analyses: { threads: number; running: number; waiting: number } }>('/api/health');

describe('analysis cost', { timeout: 600_000 }, () => {
	it('answers the 1 s loop delay with a field error, and the server stays up', async () => {
		const reply = await users[0].post('/api/v1/analyze', { ...buckDesign(), modulator: { vramp: 1.5, feedForward: false, delay: 1 } });
		expect(reply.status).toBe(400);
		expect(reply.body.error.code).toBe('invalid-design');
		expect(reply.body.error.fields['modulator.delay']).toMatch(/≤ 4 switching periods/);
		expect((await health(users[0])).status).toBe(200);
	});

	it('answers the 100 000-corner, 100 000-sample, 20 000-point document with field errors', async () => {
		const huge = {
			...buckDesign(),
			tolerances: Object.fromEntries(['l', 'c', 'esr', 'dcr', 'rdsOn', 'r1', 'r2', 'r3', 'c1', 'c2', 'c3', 'vramp', 'esl'].map((p) => [p, { tol: 0.1 }])),
			corners: { vin: { min: 10, max: 14 }, iout: { min: 0.5, max: 3 }, maxCorners: 100000 },
			spread: { samples: 100000 },
			sweep: { startHz: 1, stopHz: 1e6, points: 20000 }
		};
		const reply = await users[0].post('/api/v1/analyze', huge);
		expect(reply.status).toBe(400);
		expect(reply.body.error.fields).toMatchObject({
			'corners.maxCorners': expect.stringMatching(/≤ 4096/),
			'spread.samples': expect.stringMatching(/≤ 10000/),
			'sweep.points': expect.stringMatching(/≤ 5000/)
		});
	});

	it('keeps /api/health and pages answering while eight worst-case documents fill the pool', async () => {
		const owner = users[4];
		const workspaceId = await createWorkspace(owner, 'cost-pages');
		const page = `/w/${workspaceId}`;
		expect((await owner.get(page)).status).toBe(200); // compiled once before the abuse

		// Four users, two documents each: the per-user limit admits all eight.
		const abuse = users.slice(0, 4).flatMap((u) => [u, u]).map((u) => u.post('/api/v1/analyze', worstCaseDesign()));
		let settled = false;
		void Promise.all(abuse).then(() => (settled = true));
		let busy = await health(owner);
		while (busy.body.analyses.running < busy.body.analyses.threads || busy.body.analyses.waiting === 0) {
			expect(settled, 'the eight analyses ended before the pool was ever seen full').toBe(false);
			await new Promise((r) => setTimeout(r, 50));
			busy = await health(owner);
		}
		// Saturated: every worker computing and analyses waiting, and health answered.
		expect(busy.status).toBe(200);
		expect(busy.body.analyses.waiting).toBeGreaterThan(0);
		// A page load is served meanwhile, and the pool is still busy after it.
		const loaded = await owner.get(page);
		expect(loaded.status).toBe(200);
		expect(String(loaded.body)).toMatch(/<title>Workspace/);
		const after = await health(owner);
		expect(after.status).toBe(200);
		expect(after.body.analyses.running + after.body.analyses.waiting).toBeGreaterThan(0);

		// Each of the eight ends in an answer: the analysis, or on a slow machine 422 (over the
		// time budget) or 503 (no worker free within the queue wait); never a 500, and the
		// server is still up.
		const replies = await Promise.all(abuse);
		for (const r of replies) {
			expect([200, 422, 503]).toContain(r.status);
			if (r.status === 422) expect(r.body.error.code).toBe('analysis-too-costly');
			else if (r.status === 503) expect(r.body.error.code).toBe('analysis-busy');
			else expect(r.body.corners.corners.length).toBe(4097);
		}
		expect((await health(owner)).body).toMatchObject({ status: 'ok', analyses: { running: 0, waiting: 0 } });
	});

	it('allows one user two analyses in flight: the third answers 429', async () => {
		const u = users[0];
		const mine = Promise.all([0, 1, 2].map(() => u.post('/api/v1/analyze', worstCaseDesign())));
		// Another user is not affected meanwhile.
		const other = users[1].post('/api/v1/analyze', buckDesign());
		const replies = await mine;
		expect(replies.filter((r) => r.status === 429)).toHaveLength(1);
		const refused = replies.find((r) => r.status === 429)!;
		expect(refused.body.error.code).toBe('too-many-analyses');
		for (const r of replies.filter((r) => r.status !== 429)) expect([200, 422, 503]).toContain(r.status);
		expect((await other).status).toBe(200);
	});
});
