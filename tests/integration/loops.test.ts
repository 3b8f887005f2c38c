// Saved loops: append-only revisions with optimistic concurrency (409 on a stale base),
// engine-validated design documents completed with the rail's verification spec, the verdict
// stored at save, and the sign-off flow.
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

	it('stores the document with the rail’s spec and the engine’s verdict; without feed-forward the crossover rises with Vin', async () => {
		const eng = team.as.engineer;
		const head = (await eng.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const saved = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: buckDesign(), message: 'corners' });
		expect(saved.status).toBe(201);
		const loop = await eng.get(`/api/v1/loops/${saved.body.id}`);
		expect(loop.status).toBe(200);
		// The rail's ranges, tolerances (percent → fraction) and the workspace targets fill the document.
		const design = loop.body.design;
		expect(design.corners).toEqual({ vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } });
		expect(design.tolerances.l.tol).toBeCloseTo(0.2, 12);
		expect(design.targets).toEqual({ phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 });
		expect(design.spread).toMatchObject({ samples: expect.any(Number), seed: 1 });
		const { spread: _s, corners: _c, tolerances: _t, targets: _g, ...rest } = design;
		expect(rest).toEqual(buckDesign());
		const v = loop.body.verification;
		expect(loop.body.engineVersion).toBe(v.engineVersion);
		expect(['pass', 'caution', 'fail']).toContain(v.status);
		expect(v.targets.phaseMarginDeg).toBe(45);
		// Operating cases Vin {9, 12, 16} × Iout {0.2, 2, 3}, each with the parts as built (no factors).
		const ops = (v.corners.list as { vin: number; iout: number; factors: Record<string, number>; crossoverHz: number }[]).filter((c) => Object.keys(c.factors).length === 0);
		const cases = new Set(ops.map((c) => `${c.vin}/${c.iout}`));
		for (const vin of [9, 12, 16]) for (const iout of [0.2, 2, 3]) expect(cases.has(`${vin}/${iout}`), `${vin} V, ${iout} A`).toBe(true);
		const fc = (vin: number) => ops.find((m) => m.vin === vin && m.iout === 3)!.crossoverHz;
		// [fact of the trade] voltage-mode buck: the modulator and power stage together have the
		// gain Vin/Vramp, so with a fixed ramp the crossover moves up as Vin rises.
		expect(fc(9)).toBeLessThan(fc(12));
		expect(fc(12)).toBeLessThan(fc(16));
		expect(fc(16) / fc(9)).toBeGreaterThan(1.3);
		// A list answer carries the verdict without its corner list.
		const listed = (await eng.get(`/api/v1/rails/${railId}/loops?limit=1`)).body.items[0];
		expect(listed.verification.status).toBe(v.status);
		expect(listed.verification.corners.count).toBe(v.corners.count);
		expect(listed.verification.corners.list).toBeUndefined();
	});

	it('with feed-forward the crossover stays put across Vin', async () => {
		const eng = team.as.engineer;
		const head = (await eng.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const saved = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: buckDesign({ feedForward: true }), message: 'ff' });
		const ops = (saved.body.verification.corners.list as { vin: number; iout: number; factors: Record<string, number>; crossoverHz: number }[]).filter((c) => Object.keys(c.factors).length === 0);
		const fc = (vin: number) => ops.find((m) => m.vin === vin && m.iout === 3)!.crossoverHz;
		// [fact of the trade] feed-forward scales the ramp with Vin, cancelling the Vin in the gain.
		expect(Math.abs(fc(16) / fc(9) - 1)).toBeLessThan(0.02);
	});

	it('a saved verdict keeps its own spec: the design’s targets win at save, and a later rail edit changes nothing stored', async () => {
		const eng = team.as.engineer;
		const head = (await eng.get(`/api/v1/rails/${railId}`)).body.latestRevision as number;
		const own = { ...buckDesign(), targets: { phaseMarginDeg: 65, gainMarginDb: 10, maxCrossoverFraction: 0.2 } };
		const saved = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: head, design: own, message: 'PM 65 target' });
		expect(saved.status).toBe(201);
		expect(saved.body.verification.targets.phaseMarginDeg).toBe(65);
		const before = (await eng.get(`/api/v1/loops/${saved.body.id}`)).body;
		const patched = await team.as.owner.patch(`/api/v1/rails/${railId}`, { vinMax: 20, marginTargets: { phaseMarginDeg: 30, gainMarginDb: 3, maxCrossoverFraction: 0.4 }, tolerances: { inductorPct: 40 } });
		expect(patched.status).toBe(200);
		const after = (await eng.get(`/api/v1/loops/${saved.body.id}`)).body;
		expect(after.design).toEqual(before.design);
		expect(after.verification).toEqual(before.verification);
		// The rail's new defaults apply to the next revision only.
		const next = await eng.post(`/api/v1/rails/${railId}/loops`, { baseRevision: saved.body.revision, design: buckDesign(), message: 'after the rail edit' });
		expect(next.body.design.corners.vin).toEqual({ min: 9, max: 20 });
		expect(next.body.verification.targets.phaseMarginDeg).toBe(30);
		await team.as.owner.patch(`/api/v1/rails/${railId}`, { vinMax: 16, marginTargets: null, tolerances: { inductorPct: 20 } });
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
