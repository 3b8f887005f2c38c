// The switching check kept with a revision, through the API against MariaDB: who may run it
// (owner, engineer, reviewer; a viewer reads it; another workspace sees 404), the request's
// validation naming the field, the stored result equal to the engine's own run of the stored
// design, a repeat answered from the kept check, and the review report and signed-off JSON carrying it.
import './support/env';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { designDocumentSchema } from '../../src/lib/engine/contract/designSchema';
import { switchingCheckOfDesign } from '../../src/lib/engine/pipeline/switchingCircuit';
import { ENGINE_VERSION } from '../../src/lib/engine/version';
import { servedApp } from './support/app';
import { buckDesign } from './support/designs';
import { buildTeam, railBody, testDb, type Team } from './support/fixtures';

const app = servedApp();
const { db, pool } = testDb();
let team: Team;
let loopId: string;

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	const projectId = (await team.as.owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: 'Switching board' })).body.id;
	const rail = await team.as.owner.post(`/api/v1/projects/${projectId}/rails`, railBody('SW_CHECK'));
	expect(rail.status, JSON.stringify(rail.body)).toBe(201);
	const saved = await team.as.engineer.post(`/api/v1/rails/${rail.body.id}/loops`, { baseRevision: null, design: buckDesign(), message: 'first cut' });
	expect(saved.status, JSON.stringify(saved.body)).toBe(201);
	loopId = saved.body.id;
});
afterAll(async () => {
	await pool.end();
});

describe('switching check kept with a revision', () => {
	it('is null until someone runs it, and a viewer may read but not run it', async () => {
		const read = await team.as.viewer.get(`/api/v1/loops/${loopId}/switching-check`);
		expect(read.status).toBe(200);
		expect(read.body.switchingCheck).toBeNull();
		const exported = await team.as.viewer.get(`/api/v1/loops/${loopId}/exports/json`);
		expect(exported.status).toBe(200);
		expect(exported.body.signoff.switchingCheck).toBeNull();
		const refused = await team.as.viewer.post(`/api/v1/loops/${loopId}/switching-check`, {});
		expect(refused.status).toBe(403);
		const stranger = await team.outsider.post(`/api/v1/loops/${loopId}/switching-check`, {});
		expect(stranger.status).toBe(404);
	});

	it('names the field of a bad request: unknown keys, a non-list, a frequency outside fsw/2000 … fsw/2', async () => {
		const { reviewer } = team.as;
		const extra = await reviewer.post(`/api/v1/loops/${loopId}/switching-check`, { frequencies: [1e3] });
		expect(extra.status).toBe(400);
		const notList = await reviewer.post(`/api/v1/loops/${loopId}/switching-check`, { freqHz: 'many' });
		expect(notList.status).toBe(400);
		expect(notList.body.error.fields).toHaveProperty('freqHz');
		// fsw = 500 kHz: 100 Hz needs 5000 switching periods per injection period; 300 kHz is above fsw/2.
		const outside = await reviewer.post(`/api/v1/loops/${loopId}/switching-check`, { freqHz: [10e3, 100, 300e3] });
		expect(outside.status).toBe(400);
		expect(Object.keys(outside.body.error.fields).sort()).toEqual(['freqHz.1', 'freqHz.2']);
	});

	it("runs in the analysis pool, keeps the engine's own result with the revision, and answers a repeat from it", async () => {
		const { reviewer, engineer } = team.as;
		const ran = await reviewer.post(`/api/v1/loops/${loopId}/switching-check`, {});
		expect(ran.status, JSON.stringify(ran.body)).toBe(200);
		expect(ran.body.reused).toBe(false);
		const kept = ran.body.switchingCheck;
		expect(kept.engineVersion).toBe(ENGINE_VERSION);
		expect(kept.requestedBy).toBe(reviewer.userId);

		// The same check run here on the stored design (its spec completed at save) gives the same figures.
		const stored = await engineer.get(`/api/v1/loops/${loopId}`);
		const direct = switchingCheckOfDesign(designDocumentSchema.parse(stored.body.design));
		if ('error' in direct) throw new Error(direct.error.message);
		expect(kept.result.switching.phaseMarginDeg).toBeCloseTo(direct.switching.phaseMarginDeg!, 9);
		expect(kept.result.switching.crossoverHz).toBeCloseTo(direct.switching.crossoverHz!, 6);
		expect(kept.result.averaged).toEqual(direct.averaged);
		// [published: E&M Ch. 7 — averaging holds for a buck crossing over well below fsw (40 kHz at 500 kHz)]
		expect(kept.result.status).toBe('agrees');

		const again = await engineer.post(`/api/v1/loops/${loopId}/switching-check`, {});
		expect(again.status).toBe(200);
		expect(again.body.reused).toBe(true);
		expect(again.body.switchingCheck).toEqual(kept);

		const read = await team.as.viewer.get(`/api/v1/loops/${loopId}/switching-check`);
		expect(read.body.switchingCheck).toEqual(kept);
		const report = await team.as.viewer.get(`/api/v1/loops/${loopId}/report`);
		expect(report.status).toBe(200);
		expect(report.body.switchingCheck).toEqual(kept);
		// The signed-off JSON carries the kept check beside the verdict.
		const exported = await team.as.viewer.get(`/api/v1/loops/${loopId}/exports/json`);
		expect(exported.body.signoff.switchingCheck).toEqual(kept);
	});
});
