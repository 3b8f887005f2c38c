// Fitting a revision to a bench file through the API against MariaDB: the fit recovers a ramp
// and an ESR the hardware has (the file is the model's own loop with those two changed), anyone
// who reads the rail may run it, only owners and engineers may save it as a revision (with the
// file and the residual in its message, verified like any save), another workspace gets 404,
// and bad bodies name the field.
import './support/env';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyzeDesignDetailed, frequencyResponse, logGrid, type AnalysisDetail } from '../../src/lib/engine';
import { loopSpecFromDetail } from '../../src/lib/engine/corners/loopModel';
import { servedApp } from './support/app';
import { buckDesign } from './support/designs';
import { boardWithRails } from './support/board';
import { buildTeam, testDb, type Team } from './support/fixtures';

const app = servedApp();
const { db, pool } = testDb();
let team: Team;
let railId: string;
let otherRailId: string;
let loopId: string;
let benchId: string;
let otherBenchId: string;

/** The saved design's loop with its network as placed, the ramp 15 % higher and the ESR doubled, as an analyser CSV. */
function measuredCsv(): string {
	const detail = analyzeDesignDetailed(buckDesign()) as AnalysisDetail;
	const { parts } = loopSpecFromDetail(detail);
	const p = parts as unknown as Record<string, number>;
	const typed = buckDesign();
	const hw = {
		...typed,
		plant: { ...typed.plant, capacitors: [{ ...typed.plant.capacitors[0], esr: typed.plant.capacitors[0].esr * 2 }] },
		modulator: { ...typed.modulator, vramp: typed.modulator.vramp * 1.15 },
		compensator: { kind: 'type3', parts: { r2: p.r2, r3: p.r3, c1: p.c1, c2: p.c2, c3: p.c3 }, series: null }
	};
	const built = analyzeDesignDetailed(hw) as AnalysisDetail;
	const f = logGrid(200, 200_000, 120);
	const r = frequencyResponse(built.loop, f);
	return ['Frequency (Hz),Gain (dB),Phase (deg)', ...Array.from(f, (x, i) => `${x},${r.magDb[i]},${r.phaseDeg[i]}`)].join('\n');
}

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	const board = await boardWithRails(team, 'Fit board', { FIT_A: [{ message: 'first cut' }], FIT_B: [] });
	railId = board.railIds.FIT_A;
	otherRailId = board.railIds.FIT_B;
	loopId = board.saved.FIT_A[0].id;
	const csv = measuredCsv();
	const up = await team.as.engineer.post(`/api/v1/rails/${railId}/bench`, { fileName: 'board-a.csv', text: csv, metadata: { vin: 12, iout: 2 } });
	expect(up.status, JSON.stringify(up.body)).toBe(201);
	benchId = up.body.id;
	otherBenchId = (await team.as.engineer.post(`/api/v1/rails/${otherRailId}/bench`, { fileName: 'b.csv', text: csv })).body.id;
});
afterAll(async () => {
	await pool.end();
});

const body = { parameters: [{ name: 'vramp' }, { name: 'esr', branch: 0 }] };

describe('POST /api/v1/rails/{id}/bench/{benchId}/fit', () => {
	it('finds the ramp and the ESR the measurement was made with, for a viewer too, without saving', async () => {
		const r = await team.as.viewer.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, body);
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		const [ramp, esr] = r.body.fit.parameters;
		// The file was written with these factors (measuredCsv above): an exact model, so the fit lands on them.
		expect(ramp.fitted / ramp.typed).toBeCloseTo(1.15, 3);
		expect(esr.fitted / esr.typed).toBeCloseTo(2, 2);
		expect(ramp.outsideTolerance).toBe(ramp.tolerance !== null && ramp.tolerance < 0.15);
		expect(ramp.interval.low).toBeLessThanOrEqual(ramp.fitted);
		expect(r.body.fit.residual.after.rmsDb).toBeLessThan(r.body.fit.residual.before.rmsDb / 100);
		expect(r.body.saved).toBeNull();
		expect(r.body.against).toEqual({ loopId, revision: 1 });
	});

	it('lets an engineer save the fitted values as the next revision, verified, with the file and residual in its message', async () => {
		const r = await team.as.engineer.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, { ...body, save: true });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body.saved.revision).toBe(2);
		const loop = await team.as.viewer.get(`/api/v1/loops/${r.body.saved.id}`);
		expect(loop.body.message).toMatch(/board-a\.csv/);
		expect(loop.body.message).toMatch(/residual/);
		expect(loop.body.design.modulator.vramp).toBeCloseTo(1.5 * 1.15, 3);
		expect(loop.body.verification).toBeTruthy();
		// Saving again from r1 is stale now: the rail moved on.
		const stale = await team.as.engineer.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, { ...body, loopId, save: true });
		expect(stale.status).toBe(409);
	});

	it('refuses to save for a viewer or reviewer (403), and answers 404 to another workspace and to a file of another rail', async () => {
		expect((await team.as.viewer.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, { ...body, save: true })).status).toBe(403);
		expect((await team.as.reviewer.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, { ...body, save: true })).status).toBe(403);
		expect((await team.outsider.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, body)).status).toBe(404);
		expect((await team.as.owner.post(`/api/v1/rails/${railId}/bench/${otherBenchId}/fit`, body)).status).toBe(404);
		expect((await team.as.owner.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, { ...body, loopId: 'nope' })).status).toBe(404);
	});

	it('names the field and the rule of a bad body', async () => {
		const post = (b: unknown) => team.as.engineer.post(`/api/v1/rails/${railId}/bench/${benchId}/fit`, b);
		const empty = await post({ parameters: [] });
		expect(empty.status).toBe(400);
		expect(empty.body.error.fields.parameters).toBe('mark at least one parameter as uncertain');
		const unknown = await post({ parameters: [{ name: 'q' }] });
		expect(unknown.body.error.fields['parameters.0.name']).toMatch(/must be one of/);
		const extra = await post({ ...body, hack: 1 });
		expect(extra.status).toBe(400);
		const big = await post({ ...body, maxIterations: 1e9 });
		expect(big.body.error.fields.maxIterations).toMatch(/≤ 200/);
		const esl = await post({ parameters: [{ name: 'esl' }] });
		expect(esl.status).toBe(400);
		expect(esl.body.error.code).toBe('invalid-fit');
		expect(esl.body.error.fields['parameters.0.name']).toMatch(/is 0 in the design/);
	});
});
