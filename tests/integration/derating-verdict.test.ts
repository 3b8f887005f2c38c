// A ceramic-only rail's stored verdict follows its capacitors' derating: the
// same network saved twice, the second time with the bank's DC-bias point, temperature class and
// a temperature range, stores a different verdict (lower margins, T corners named).
import './support/env';
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../src/lib/engine/analyze';
import { teamWithBoard } from './support/board';
import { buckDesign } from './support/designs';

const board = teamWithBoard('Derating board');

type Saved = { revision: number; verification: { status: string; nominal: { phaseMarginDeg: number }; worst: { phaseMarginDeg: { value: number; corner: string } }; corners: { list: { label: string }[] } } };

describe('derating reaches the stored verdict', () => {
	it('a ceramic-only rail: the derated revision stores lower margins, the T corners and a worse status', async () => {
		const rail = await board.newRail('DR');
		// The network fixed as built, so only the bank changes between the revisions.
		const placed = analyzeDesign(buckDesign()) as { compensator: { rounded: { parts: Record<string, number> } } };
		const { r1: _r1, rb: _rb, ...parts } = placed.compensator.rounded.parts;
		const design = { ...buckDesign(), compensator: { kind: 'type3', parts, series: null }, corners: { vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } } };
		const first = await board.save(rail.id, design, { message: 'typed values' });
		// 22 µF X5R at 5 V keeping 8 µF per part [common practice: small-case X5R parts keep a third to a half at two thirds of rating]
		const derated = structuredClone(design) as typeof design & { corners: Record<string, unknown> };
		Object.assign(derated.plant.capacitors[0], { dcBias: { points: [{ v: 5, c: 8e-6 }] }, tempClass: 'X5R' });
		derated.corners.temperature = { min: -40, max: 85 };
		const second = await board.save(rail.id, derated, { base: 1, message: 'derated bank' });
		const a = (first as unknown as Saved).verification;
		const b = (second as unknown as Saved).verification;
		expect(b.nominal.phaseMarginDeg).toBeLessThan(a.nominal.phaseMarginDeg - 5);
		expect(b.worst.phaseMarginDeg.value).toBeLessThan(a.worst.phaseMarginDeg.value - 10);
		expect(b.worst.phaseMarginDeg.corner).toMatch(/T (min|max)/);
		expect(b.corners.list.map((c) => c.label)).toContain('Vin nom, Iout nom, T nom');
		expect(a.status).not.toBe('fail');
		expect(b.status).toBe('fail');
		// The stored revision reads back the same (the board and exports read it).
		const back = await board.team.as.viewer.get(`/api/v1/loops/${second.id}`);
		expect(back.status).toBe(200);
		expect(back.body.verification.status).toBe('fail');
	});
});
