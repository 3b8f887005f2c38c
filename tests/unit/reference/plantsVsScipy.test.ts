/**
 * Engine power stages (Gvd, Gvg, Zo, operating point) against the scipy averaged state-space
 * reference in reference/scipy/out: a numerically linearised averaged circuit built without the
 * engine's closed forms [published: Middlebrook & Ćuk, PESC 1976, state-space averaging;
 * computed with scipy.signal, versions in each JSON]. Tolerance 0.01 dB / 0.1° (reference/README.md, "Tolerances used by the tests").
 */
import { describe, expect, it } from 'vitest';
import { frequencyResponse, powerStage } from '$lib/engine';
import { caseNames, describeDeviation, loadCase, loadOutput, worstDeviation, stageInput } from './referenceData';

const MAG_TOL_DB = 0.01;
const PHASE_TOL_DEG = 0.1;

describe.each(caseNames())('power stage %s vs scipy state-space reference', (name) => {
	const doc = loadCase(name);
	const ref = loadOutput('scipy', name);
	const model = powerStage(stageInput(doc));
	const grid = Float64Array.from(ref.freqHz);

	it('operating point: duty and conduction efficiency', () => {
		// [scipy reference: brentq on the averaged DC equations]
		expect(model.operatingPoint.duty, `${name}: duty`).toBeCloseTo(ref.operatingPoint.duty, 10);
		expect(model.operatingPoint.efficiency, `${name}: efficiency`).toBeCloseTo(ref.operatingPoint.efficiency, 10);
		expect(model.operatingPoint.inductorCurrent, `${name}: inductor current`).toBeCloseTo(ref.operatingPoint.inductorCurrent!, 9);
	});

	for (const key of ['gvd', 'gvg', 'zo'] as const) {
		it(`${key} within ${MAG_TOL_DB} dB and ${PHASE_TOL_DEG}° over the sweep`, () => {
			const got = frequencyResponse(model[key], grid);
			const dev = worstDeviation(ref.freqHz, ref.responses[key], got);
			expect(dev.magDb.value, describeDeviation(`${name} ${key} magnitude`, dev.magDb, 'dB')).toBeLessThanOrEqual(MAG_TOL_DB);
			expect(dev.phaseDeg.value, describeDeviation(`${name} ${key} phase`, dev.phaseDeg, '°')).toBeLessThanOrEqual(PHASE_TOL_DEG);
		});
	}
});
