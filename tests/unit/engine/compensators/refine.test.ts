/**
 * Placement that survives its own verdict (DEVELOPERS.md, "Verdict rules"): with a finite op-amp the K-factor's ideal
 * parts miss the request (the issue saw 106.5 kHz / 46.3° for 100 kHz / 55° with 80 dB / 5 MHz);
 * the refined placement meets it on the built loop, op-amp model included. With placeFor
 * 'worst-corner' the built parts meet the PM target at every operating case.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, isContractError, verifyDesign, type AnalysisResponse, type Verification } from '../../../../src/lib/engine';

// An invented 12 V → 1.2 V, 8 A buck at 1 MHz, crossed at fsw/10 with a Type III.
const base = {
	schemaVersion: 1,
	plant: { topology: 'buck', vin: 12, vout: 1.2, iout: 8, fsw: 1e6, inductor: { l: 0.47e-6, dcr: 0.004 }, capacitors: [{ c: 47e-6, esr: 0.002, count: 4 }], rdsOn: 0.006 },
	modulator: { vramp: 1 },
	feedback: { vref: 0.6, r1: 10000 },
	compensator: { kind: 'type3', series: null, target: { method: 'k-factor', crossoverHz: 100e3, phaseMarginDeg: 55 } }
} as const;
const opamp = { a0Db: 80, gbw: 5e6 };

const analyse = (doc: unknown) => {
	const r = analyzeDesign(doc, { includeResponse: false });
	if (isContractError(r)) throw new Error(r.error.message);
	return r as AnalysisResponse;
};

describe('placement with the op-amp model', () => {
	it('the ideal parts built with an 80 dB / 5 MHz op-amp miss 100 kHz / 55° [the shift a finite op-amp causes]', () => {
		const ideal = analyse(base).compensator.ideal.parts;
		const { r1: _r1, rb: _rb, ...parts } = ideal;
		const built = analyse({ ...base, compensator: { kind: 'type3', series: null, parts, opamp } });
		expect(Math.abs(built.metrics.crossoverHz! / 100e3 - 1)).toBeGreaterThan(0.02);
		expect(55 - built.metrics.phaseMarginDeg!).toBeGreaterThan(3);
	});

	it('refined placement meets fc within 0.5 % and PM within 0.2° on the built loop with the op-amp [the request itself]', () => {
		const r = analyse({ ...base, compensator: { ...base.compensator, opamp } });
		expect(Math.abs(r.metrics.crossoverHz! / 100e3 - 1)).toBeLessThan(0.005);
		expect(Math.abs(r.metrics.phaseMarginDeg! - 55)).toBeLessThan(0.2);
		expect(r.warnings.map((w) => w.code)).not.toContain('placement-target-missed');
	});
});

describe('placement for the worst corner', () => {
	const ranges = { vin: { min: 9, max: 16 }, iout: { min: 1, max: 10 } };
	const doc = (placeFor: 'nominal' | 'worst-corner') => ({
		...base,
		corners: ranges,
		targets: { phaseMarginDeg: 55 },
		compensator: { ...base.compensator, target: { ...base.compensator.target, placeFor } }
	});

	it('nominal placement leaves a corner below the target; worst-corner placement lifts every corner to it', () => {
		const nominal = verifyDesign(doc('nominal')) as Verification;
		const worst = verifyDesign(doc('worst-corner')) as Verification;
		expect(nominal.worst.phaseMarginDeg!.value).toBeLessThan(54);
		// the iteration stops within 0.1° of the target [refine.ts tolerance]
		expect(worst.worst.phaseMarginDeg!.value).toBeGreaterThanOrEqual(55 - 0.1);
		for (const c of worst.corners.list) if (c.error === null) expect(c.phaseMarginDeg!).toBeGreaterThanOrEqual(55 - 0.1);
		// the nominal keeps its crossover; its PM is above the target
		expect(worst.nominal.crossoverHz! / 100e3).toBeCloseTo(1, 2);
		expect(worst.nominal.phaseMarginDeg!).toBeGreaterThan(55);
	});

	it('says why when a network type cannot give the boost the worst corner needs', () => {
		const r = analyse({ ...doc('worst-corner'), compensator: { kind: 'type2', series: null, target: { method: 'k-factor', crossoverHz: 100e3, phaseMarginDeg: 70, placeFor: 'worst-corner' } } });
		const w = r.warnings.find((x) => x.code === 'placement-target-missed');
		expect(w?.message).toMatch(/phase boost/);
	});

	it('the nominal corner of the verdict is the nominal analysis', () => {
		const v = verifyDesign(doc('worst-corner')) as Verification;
		const nominal = v.corners.list[0];
		expect(nominal.label).toBe('Vin nom, Iout nom');
		expect(nominal.phaseMarginDeg).toBeCloseTo(v.nominal.phaseMarginDeg!, 9);
	});
});
