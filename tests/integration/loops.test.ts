// Saved loops: append-only revisions with optimistic concurrency (409 on a stale base),
// engine-validated design documents, metrics at every corner, and the sign-off flow.
import './support/env';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { servedApp } from './support/app';
import { buckDesign } from './support/designs';
import { buildTeam, railBody, testDb, type Team } from './support/fixtures';

const app = servedApp();
let team: Team;
const { db, pool } = testDb();
let railId: string;

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	const project = await team.as.engineer.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: 'Loop board' });
	railId = (await team.as.engineer.post(`/api/v1/projects/${project.body.id}/rails`, railBody())).body.id;
});

afterAll(async () => {
	await pool.end();
});

describe('loop revisions', () => {
	it('numbers revisions r1, r2, … and answers 409 with the current revision on a stale base', async () => {
		const eng = team.as.engineer;
		const r1 = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: null, design: buckDesign(), message: 'first cut' });
		expect(r1.status).toBe(201);
		expect(r1.body).toMatchObject({ revision: 1, schemaVersion: 1, status: 'draft', authorId: eng.userId });

		const r2 = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: 1, design: buckDesign({ crossoverHz: 35_000 }), message: 'lower fc' });
		expect(r2.body.revision).toBe(2);

		// The owner edited from r1 too, without seeing r2: refused, nothing lost.
		const stale = await team.as.owner.post(`/api/v1/rails/${railId}/loops`, { baseRevision: 1, design: buckDesign(), message: 'my edit' });
		expect(stale.status).toBe(409);
		expect(stale.body.error).toMatchObject({ code: 'stale-revision', currentRevision: 2, current: { id: r2.body.id, revision: 2 } });
		expect(stale.body.error.current.design.compensator.target.crossoverHz).toBe(35_000);

		const list = await team.as.viewer.get(`/api/v1/rails/${railId}/loops`);
		expect(list.body.items.map((l: { revision: number }) => l.revision)).toEqual([2, 1]);
		expect(list.body.page.total).toBe(2);

		const rail = await team.as.viewer.get(`/api/v1/rails/${railId}`);
		expect(rail.body.latestRevision).toBe(2);
	});

	it('lets only one of two simultaneous saves from the same base through', async () => {
		const eng = team.as.engineer;
		const head = (await eng.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const body = (message: string) => ({ baseRevision: head, design: buckDesign(), message });
		const replies = await Promise.all([eng.post(`/api/v1/rails/${railId}/loops`, body('a')), team.as.owner.post(`/api/v1/rails/${railId}/loops`, body('b'))]);
		expect(replies.map((r) => r.status).sort()).toEqual([201, 409]);
	});

	it('stores metrics at all six corners; without feed-forward the crossover rises with Vin', async () => {
		const eng = team.as.engineer;
		const head = (await eng.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const saved = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: buckDesign(), message: 'corners' });
		const loop = await eng.get(`/api/v1/loops/${saved.body.id}`);
		expect(loop.status).toBe(200);
		const metrics = loop.body.metrics as { corner: { vin: number; iout: number }; crossoverHz: number }[];
		expect(metrics.map((m) => `${m.corner.vin}/${m.corner.iout}`)).toEqual(['12/3', '12/0.2', '9/3', '9/0.2', '16/3', '16/0.2']);
		const fc = (vin: number) => metrics.find((m) => m.corner.vin === vin && m.corner.iout === 3)!.crossoverHz;
		// [fact of the trade] voltage-mode buck: the modulator and power stage together have the
		// gain Vin/Vramp, so with a fixed ramp the crossover moves up as Vin rises.
		expect(fc(9)).toBeLessThan(fc(12));
		expect(fc(12)).toBeLessThan(fc(16));
		expect(fc(16) / fc(9)).toBeGreaterThan(1.3);
		expect(loop.body.design).toEqual(buckDesign());
	});

	it('with feed-forward the crossover stays put across Vin', async () => {
		const eng = team.as.engineer;
		const head = (await eng.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const saved = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: buckDesign({ feedForward: true }), message: 'ff' });
		const metrics = saved.body.metrics as { corner: { vin: number; iout: number }; crossoverHz: number }[];
		const fc = (vin: number) => metrics.find((m) => m.corner.vin === vin && m.corner.iout === 3)!.crossoverHz;
		// [fact of the trade] feed-forward scales the ramp with Vin, cancelling the Vin in the gain.
		expect(Math.abs(fc(16) / fc(9) - 1)).toBeLessThan(0.02);
	});

	it('refuses invalid designs with field paths, and a design of the wrong topology with 422', async () => {
		const eng = team.as.engineer;
		const head = (await eng.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const broken = buckDesign() as any;
		broken.plant.inductor.l = -1;
		const bad = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: broken, message: 'oops' });
		expect(bad.status).toBe(400);
		expect(bad.body.error.code).toBe('invalid-design');
		expect(bad.body.error.fields['design.plant.inductor.l']).toMatch(/> 0/);

		const boost = buckDesign() as any;
		boost.plant = { ...boost.plant, topology: 'boost', vin: 5, vout: 12 };
		const wrong = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: boost, message: 'boost?' });
		expect(wrong.status).toBe(422);
		expect(wrong.body.error.code).toBe('topology-mismatch');

		const noMessage = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: buckDesign() });
		expect(noMessage.status).toBe(400);
		expect(noMessage.body.error.fields.message).toBeDefined();
	});
});

describe('sign-off', () => {
	it('moves draft → in-review → changes-requested → (new revision) → in-review → approved, with audit rows', async () => {
		const { engineer, reviewer } = team.as;
		const head = (await engineer.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const draft = (await engineer.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: buckDesign(), message: 'for review' })).body;

		expect((await reviewer.post(`/api/v1/loops/${draft.id}/review`, { action: 'approve' })).status).toBe(422);
		expect((await engineer.post(`/api/v1/loops/${draft.id}/review`, { action: 'request-review' })).body.status).toBe('in-review');
		const sentBack = await reviewer.post(`/api/v1/loops/${draft.id}/review`, { action: 'request-changes', comment: 'PM at Vin max, Iout min is thin' });
		expect(sentBack.body.status).toBe('changes-requested');
		const comments = await engineer.get(`/api/v1/loops/${draft.id}/comments`);
		expect(comments.body.items[0]).toMatchObject({ body: 'PM at Vin max, Iout min is thin', authorId: reviewer.userId });

		const fixed = (await engineer.post(`/api/v1/rails/${railId}/loops`, { baseRevision: draft.revision, design: buckDesign({ crossoverHz: 30_000 }), message: 'more margin' })).body;
		await engineer.post(`/api/v1/loops/${fixed.id}/review`, { action: 'request-review' });
		const approved = await reviewer.post(`/api/v1/loops/${fixed.id}/review`, { action: 'approve' });
		expect(approved.status).toBe(200);
		expect(approved.body).toMatchObject({ status: 'approved', statusChangedBy: reviewer.userId });
		// The earlier revision keeps its own status: revisions are append-only.
		expect((await engineer.get(`/api/v1/loops/${draft.id}`)).body.status).toBe('changes-requested');

		const trail = await team.as.viewer.get(`/api/v1/audit?workspace=${team.workspaceId}&entityId=${fixed.id}`);
		expect(trail.body.items.map((a: { action: string }) => a.action)).toEqual(['loop.approve', 'loop.request-review', 'loop.save']);
		expect(trail.body.items[0]).toMatchObject({ actorId: reviewer.userId, before: { status: 'in-review' }, after: { status: 'approved' } });
	});
});

describe('stateless analysis', () => {
	it('returns the engine response, or 400 with field errors', async () => {
		const ok = await team.as.viewer.post('/api/v1/analyze', buckDesign());
		expect(ok.status).toBe(200);
		expect(ok.body.metrics.crossoverHz).toBeGreaterThan(30_000);
		expect(ok.body.response.freqHz.length).toBeGreaterThan(100);
		const bad = await team.as.viewer.post('/api/v1/analyze', { ...buckDesign(), schemaVersion: 7 });
		expect(bad.status).toBe(400);
		expect(bad.body.error.code).toBe('invalid-design');
		expect(bad.body.error.fields.schemaVersion).toBeDefined();
	});
});
