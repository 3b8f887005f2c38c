/**
 * Engine power stages against ngspice AC analysis of averaged-switch netlists
 * (reference/ngspice: B-source averaged switch, R/L/C branches, duty found by .op bisection;
 * [published: Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed., ch. 7 averaged
 * switch modelling, from memory]; ngspice version in each JSON). Tolerance 0.05 dB / 0.5° up to
 * fsw/2, where the averaged model is trusted (reference/README.md, "Tolerances used by the tests"; docs/formulas.md §0).
 */
import { describe, expect, it } from 'vitest';
import { frequencyResponse, powerStage } from '$lib/engine';
import { caseNames, describeDeviation, loadCase, loadOutput, stageInput, worstDeviation } from './referenceData';

const MAG_TOL_DB = 0.05;
const PHASE_TOL_DEG = 0.5;

describe.each(caseNames())('power stage %s vs ngspice averaged netlist', (name) => {
	const doc = loadCase(name);
	const ref = loadOutput('ngspice', name);
	const model = powerStage(stageInput(doc));
	const grid = Float64Array.from(ref.freqHz);
	const halfFsw = doc.plant.fsw / 2;

	it('operating point found by ngspice', () => {
		expect(model.operatingPoint.duty, `${name}: duty`).toBeCloseTo(ref.operatingPoint.duty, 8);
		expect(model.operatingPoint.efficiency, `${name}: efficiency`).toBeCloseTo(ref.operatingPoint.efficiency, 8);
	});

	for (const key of ['gvd', 'gvg', 'zo'] as const) {
		it(`${key} within ${MAG_TOL_DB} dB and ${PHASE_TOL_DEG}° up to fsw/2`, () => {
			const got = frequencyResponse(model[key], grid);
			const dev = worstDeviation(ref.freqHz, ref.responses[key], got, halfFsw);
			expect(dev.magDb.index, `${name}: no ngspice point below fsw/2`).toBeGreaterThanOrEqual(0);
			expect(dev.magDb.value, describeDeviation(`${name} ${key} magnitude`, dev.magDb, 'dB')).toBeLessThanOrEqual(MAG_TOL_DB);
			expect(dev.phaseDeg.value, describeDeviation(`${name} ${key} phase`, dev.phaseDeg, '°')).toBeLessThanOrEqual(PHASE_TOL_DEG);
		});
	}
});
