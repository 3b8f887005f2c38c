// A ceramic-only rail's stored verdict follows its capacitors' derating: the
// same network saved twice, the second time with the bank's DC-bias point, temperature class and
// a temperature range, stores a different verdict (lower margins, T corners named).
import './support/env';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/lib/engine/analyze';
import { servedApp } from './support/app';
import { buckDesign } from './support/designs';
import { buildTeam, railBody, testDb, type Team } from './support/fixtures';

const app = servedApp();
const { db, pool } = testDb();
let team: Team;
let projectId: string;

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	projectId = (await team.as.owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: 'Derating board' })).body.id;
});
afterAll(async () => {
	await pool.end();
});

type Saved = { revision: number; verification: { status: string; nominal: { phaseMarginDeg: number }; worst: { phaseMarginDeg: { value: number; corner: string } }; corners: { list: { label: string }[] } } };

describe('derating reaches the stored verdict', () => {
	it('a ceramic-only rail: the derated revision stores lower margins, the T corners and a worse status', async () => {
		const rail = await team.as.owner.post(`/api/v1/projects/${projectId}/rails`, railBody(`DR_${randomUUID().slice(0, 4).toUpperCase()}`));
		expect(rail.status).toBe(201);
		// The network fixed as built, so only the bank changes between the revisions.
		const placed = analyzeDesign(buckDesign()) as { compensator: { rounded: { parts: Record<string, number> } } };
		const { r1: _r1, rb: _rb, ...parts } = placed.compensator.rounded.parts;
		const design = { ...buckDesign(), compensator: { kind: 'type3', parts, series: null }, corners: { vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } } };
		const first = await team.as.engineer.post(`/api/v1/rails/${rail.body.id}/loops`, { baseRevision: null, design, message: 'typed values' });
		expect(first.status, JSON.stringify(first.body)).toBe(201);
		// 22 µF X5R at 5 V keeping 8 µF per part [common practice: small-case X5R parts keep a third to a half at two thirds of rating]
		const derated = structuredClone(design) as typeof design & { corners: Record<string, unknown> };
		Object.assign(derated.plant.capacitors[0], { dcBias: { points: [{ v: 5, c: 8e-6 }] }, tempClass: 'X5R' });
		derated.corners.temperature = { min: -40, max: 85 };
		const second = await team.as.engineer.post(`/api/v1/rails/${rail.body.id}/loops`, { baseRevision: 1, design: derated, message: 'derated bank' });
		expect(second.status, JSON.stringify(second.body)).toBe(201);
		const a = (first.body as Saved).verification;
		const b = (second.body as Saved).verification;
		expect(b.nominal.phaseMarginDeg).toBeLessThan(a.nominal.phaseMarginDeg - 5);
		expect(b.worst.phaseMarginDeg.value).toBeLessThan(a.worst.phaseMarginDeg.value - 10);
		expect(b.worst.phaseMarginDeg.corner).toMatch(/T (min|max)/);
		expect(b.corners.list.map((c) => c.label)).toContain('Vin nom, Iout nom, T nom');
		expect(a.status).not.toBe('fail');
		expect(b.status).toBe('fail');
		// The stored revision reads back the same (the board and exports read it).
		const back = await team.as.viewer.get(`/api/v1/loops/${(second.body as { id: string }).id}`);
		expect(back.status).toBe(200);
		expect(back.body.verification.status).toBe('fail');
	});
});
