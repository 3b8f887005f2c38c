// The design screen's operating cases are analysed from the nominal's parsed document with only
// the plant, modulator and fixed network parsed again (analysis.ts validatedCorner), the network's
// response evaluated once for every case and the closed-loop poles left out. Every trace and
// margin must still be what the engine's own analysis of that case's document gives
// (analyzeDesignDetailed, the public entry, closed-loop poles included): the engine's figures are the ones
// checked against outside references (reference/margins, numpy), so agreement with it to 1e-9
// relative is the check here. Designs: a buck with two banks (Type III, rounded parts), a boost,
// a buck with a finite op-amp, and a Type II with feed-forward and a loop delay.
import { describe, expect, it } from 'vitest';
import { analyzeForm, fixedCompensator } from '$lib/design/analysis';
import { demoForm, readForm, starterForm, type DesignForm } from '$lib/design/form';
import { analyzeDesignDetailed, operatingPointDocument } from '$lib/engine';

const REL = 1e-9;
function near(actual: number | null, expected: number | null, what: string) {
	if (expected === null || actual === null) return expect(actual, what).toBe(expected);
	expect(Math.abs(actual - expected), `${what}: ${actual} vs ${expected}`).toBeLessThanOrEqual(REL * Math.max(Math.abs(expected), 1e-12));
}
/** The largest relative difference of two traces (one expect per trace, not per sample). */
function nearArray(actual: ArrayLike<number>, expected: ArrayLike<number>, what: string) {
	expect(actual.length, what).toBe(expected.length);
	let worst = 0;
	for (let i = 0; i < expected.length; i++) worst = Math.max(worst, Math.abs(actual[i] - expected[i]) / Math.max(Math.abs(expected[i]), 1e-12));
	expect(worst, what).toBeLessThanOrEqual(REL);
}

function check(form: DesignForm) {
	const outcome = analyzeForm(readForm(form));
	if (!outcome.ok) throw new Error(outcome.message);
	const a = outcome.analysis;
	const fixed = fixedCompensator(a.nominal);
	expect(a.corners.length).toBeGreaterThan(1);
	let compared = 0;
	for (const corner of a.corners) {
		if (corner.corner.nominal) continue;
		// The engine's analysis with its closed-loop poles (closedLoopPoles defaults to true); the
		// closed-loop and robustness sections are not what the plot shows.
		const whole = analyzeDesignDetailed(operatingPointDocument(a.document, corner.corner, fixed), { closedLoop: false, sections: false });
		if ('error' in whole) {
			expect(corner.error).toBe(whole.error.message);
			continue;
		}
		compared++;
		const mine = corner.detail!.response;
		const ref = whole.response;
		for (const key of ['loop', 'plant', 'compensator'] as const) {
			nearArray(mine.response[key].magDb, ref.response[key].magDb, `${corner.corner.label} ${key} dB`);
			nearArray(mine.response[key].phaseDeg, ref.response[key].phaseDeg, `${corner.corner.label} ${key} °`);
		}
		const m = mine.metrics;
		const r = ref.metrics;
		for (const key of ['crossoverHz', 'phaseMarginDeg', 'gainMarginDb', 'phaseCrossoverHz', 'delayMarginS', 'gainReductionMarginDb', 'modulusMargin', 'modulusMarginHz'] as const) {
			near(m[key], r[key], `${corner.corner.label} ${key}`);
		}
		expect(m.crossovers.length).toBe(r.crossovers.length);
		m.crossovers.forEach((x, i) => near(x.phaseMarginDeg, r.crossovers[i].phaseMarginDeg, `${corner.corner.label} crossing ${i}`));
		expect(m.phaseCrossovers.length).toBe(r.phaseCrossovers.length);
		m.phaseCrossovers.forEach((x, i) => near(x.gainMarginDb, r.phaseCrossovers[i].gainMarginDb, `${corner.corner.label} phase crossing ${i}`));
		expect(m.closedLoopStable).toBe(r.closedLoopStable);
		expect(mine.operatingPoint).toEqual(ref.operatingPoint);
		expect(mine.warnings).toEqual(ref.warnings);
	}
	expect(compared).toBeGreaterThan(0);
}

const boost = () => starterForm({ name: '5V0_SENSOR', topology: 'boost', vout: 5, vinNom: 3.7, vinMin: 3, vinMax: 4.2, ioutNom: 0.3, ioutMin: 0.03, ioutMax: 0.45, fsw: 1e6 } as Parameters<typeof starterForm>[0]);

describe('analyzeForm operating cases', () => {
	it('match the engine analysis of each case (buck, two banks, Type III rounded)', () => check(demoForm()));
	it('match the engine analysis of each case (boost)', () => check(boost()));
	it('match the engine analysis of each case (buck with a finite op-amp)', () => check({ ...demoForm(), opamp: true, a0Db: '80', gbw: '5MEG' }));
	it('match the engine analysis of each case (Type II, feed-forward ramp, loop delay)', () => check({ ...demoForm(), kind: 'type2', zeros: [''], poles: [''], fcTarget: '40k', feedForward: true, delay: '150n' }));
});
