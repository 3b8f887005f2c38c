// The document limits that bound the cost of one analysis (README.md, "Limits"): each scaling field has a
// ceiling with a field error that names the rule, and the worst accepted delay and sweep give a
// bounded number of phase crossovers. Before these limits `modulator.delay: 1` was accepted and
// listed six million phase crossovers (500 MB of answer, the server out of memory).
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '$lib/engine/analyze';
import { designDocumentSchema, MAX_DELAY_PERIODS, MAX_SWEEP_FSW_MULTIPLE, MAX_SWEEP_POINTS } from '$lib/engine/contract/designSchema';
import { MAX_CORNERS } from '$lib/engine/corners/schema';
import { MAX_SAMPLES } from '$lib/engine/spread/spread';
import { contractExample } from '../../support/contractExample';

type Doc = ReturnType<typeof contractExample> & Record<string, unknown>;
function fieldsOf(change: (d: Doc) => void): Record<string, string> {
	const d = contractExample() as Doc;
	change(d);
	const r = designDocumentSchema.safeParse(d);
	if (r.success) throw new Error('expected the schema to refuse the document');
	return Object.fromEntries(r.error.issues.map((i) => [i.path.join('.'), i.message]));
}
const accepts = (change: (d: Doc) => void) => {
	const d = contractExample() as Doc;
	change(d);
	return designDocumentSchema.safeParse(d).success;
};

describe('cost limits of the design document', () => {
	const fsw = contractExample().plant.fsw;

	it('modulator.delay: at most 4 switching periods, named in the message', () => {
		// The issue's attack: a 1 s delay; now a field error from the schema, before any work.
		const f = fieldsOf((d) => (d.modulator.delay = 1));
		expect(f['modulator.delay']).toMatch(/≤ 4 switching periods/);
		expect(f['modulator.delay']).toMatch(/plant\.fsw/);
		expect(accepts((d) => (d.modulator.delay = MAX_DELAY_PERIODS / fsw))).toBe(true);
		expect(accepts((d) => (d.modulator.delay = (MAX_DELAY_PERIODS / fsw) * 1.001))).toBe(false);
		// The analysis answers the same error (the API's 400), without analysing.
		const d = contractExample();
		d.modulator.delay = 0.005;
		const r = analyzeDesign(d);
		expect('error' in r && r.error.fields['modulator.delay']).toMatch(/switching periods/);
	});

	it('sweep: at most 5000 points, ending by 10 × fsw (range and list alike)', () => {
		expect(fieldsOf((d) => (d.sweep = { startHz: 10, stopHz: 1e6, points: MAX_SWEEP_POINTS + 1 }))['sweep.points']).toMatch(/≤ 5000/);
		expect(fieldsOf((d) => (d.sweep = { startHz: 10, stopHz: 1e12, points: 400 }))['sweep.stopHz']).toMatch(/≤ 10 × plant\.fsw/);
		expect(fieldsOf((d) => ((d as Record<string, unknown>).sweep = { freqHz: [10, 1e3, 7e6] }))['sweep.freqHz.2']).toMatch(/≤ 10 × plant\.fsw/);
		expect(accepts((d) => (d.sweep = { startHz: 10, stopHz: MAX_SWEEP_FSW_MULTIPLE * fsw, points: MAX_SWEEP_POINTS }))).toBe(true);
	});

	it('corners.maxCorners ≤ 4096 and spread.samples ≤ 10 000', () => {
		expect(fieldsOf((d) => (d.corners = { maxCorners: 100000 }))['corners.maxCorners']).toMatch(/≤ 4096/);
		expect(accepts((d) => (d.corners = { maxCorners: MAX_CORNERS }))).toBe(true);
		expect(fieldsOf((d) => (d.spread = { samples: 100000 }))['spread.samples']).toMatch(/≤ 10000/);
		expect(accepts((d) => (d.spread = { samples: MAX_SAMPLES }))).toBe(true);
	});

	it('tolerances: only the named parts (so at most one entry per part)', () => {
		expect(Object.keys(fieldsOf((d) => (d.tolerances = { l: { tol: 0.1 }, q17: { tol: 0.1 } } as never))).join()).toMatch(/tolerances/);
	});

	it('the worst accepted delay and sweep give at most 40 delay turns of phase crossovers', () => {
		// ∠e^(−jωTd) = −360°·f·Td [from memory: any control text]: with Td = 4/fsw the delay alone
		// turns 4 × 10 = 40 times up to 10·fsw, so at most 40 phase crossovers from the delay, plus
		// the few the plant and network give (two here without delay).
		const d = contractExample();
		d.modulator.delay = MAX_DELAY_PERIODS / fsw;
		d.sweep = { startHz: 10, stopHz: MAX_SWEEP_FSW_MULTIPLE * fsw, points: 400 };
		const r = analyzeDesign(d);
		if ('error' in r) throw new Error(r.error.message);
		expect(r.metrics.phaseCrossovers.length).toBeGreaterThan(30);
		expect(r.metrics.phaseCrossovers.length).toBeLessThanOrEqual(MAX_DELAY_PERIODS * MAX_SWEEP_FSW_MULTIPLE + 2);
		// The Padé order for the closed-loop poles stays within its 2…8 range (closedLoop.ts).
		expect(r.metrics.padeOrder).toBeLessThanOrEqual(8);
	});
});
