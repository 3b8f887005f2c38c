/**
 * `analyzeDesign` (the contract's entry point) against the outside references for every case in
 * reference/cases: operating point, response.plant (Gvd), response.compensator, response.loop
 * and the metrics. scipy (averaged state-space, scipy.signal; versions in the JSON) within
 * 0.01 dB / 0.1° over the sweep; ngspice (averaged-switch netlist AC analysis) within
 * 0.05 dB / 0.5° up to fsw/2 (reference/README.md, "Tolerances used by the tests").
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '$lib/engine';
import { caseNames, describeDeviation, loadCase, loadOutput, worstDeviation, type DesignDoc } from './referenceData';

function analyzeOn(doc: DesignDoc, freqHz: number[], name: string) {
	const res = analyzeDesign({ ...doc, sweep: { freqHz } });
	if ('error' in res) throw new Error(`${name}: analyzeDesign rejected the case: ${res.error.message}`);
	return res;
}

describe.each(caseNames())('analyzeDesign %s vs references', (name) => {
	const doc = loadCase(name);
	const scipy = loadOutput('scipy', name);
	const spice = loadOutput('ngspice', name);

	it('operating point, responses and metrics match scipy', () => {
		const res = analyzeOn(doc, scipy.freqHz, name);
		expect(res.operatingPoint.duty, `${name}: duty`).toBeCloseTo(scipy.operatingPoint.duty, 10);
		expect(res.operatingPoint.efficiency, `${name}: efficiency`).toBeCloseTo(scipy.operatingPoint.efficiency, 10);
		expect(res.response.freqHz.length, `${name}: grid length`).toBe(scipy.freqHz.length);
		for (const [key, refKey] of [['plant', 'gvd'], ['compensator', 'compensator'], ['loop', 'loop']] as const) {
			const dev = worstDeviation(scipy.freqHz, scipy.responses[refKey], res.response[key]);
			expect(dev.magDb.value, describeDeviation(`${name} response.${key} magnitude`, dev.magDb, 'dB')).toBeLessThanOrEqual(0.01);
			expect(dev.phaseDeg.value, describeDeviation(`${name} response.${key} phase`, dev.phaseDeg, '°')).toBeLessThanOrEqual(0.1);
		}
		const ref = scipy.metrics!;
		expect(res.metrics.crossovers.length, `${name}: gain crossovers`).toBe(ref.crossovers.length);
		expect(res.metrics.crossoverHz! / ref.crossoverHz! - 1, `${name}: crossover ${ref.crossoverHz} Hz`).toBeCloseTo(0, 6);
		expect(res.metrics.phaseMarginDeg, `${name}: phase margin`).toBeCloseTo(ref.phaseMarginDeg!, 3);
		if (ref.gainMarginDb === null) expect(res.metrics.gainMarginDb, `${name}: no positive GM in range`).toBeNull();
		else expect(res.metrics.gainMarginDb, `${name}: gain margin`).toBeCloseTo(ref.gainMarginDb, 3);
		if (ref.closedLoopStable !== null) expect(res.metrics.closedLoopStable, `${name}: closed-loop stability`).toBe(ref.closedLoopStable);
	});

	it('plant and loop match ngspice up to fsw/2', () => {
		const res = analyzeOn(doc, spice.freqHz, name);
		for (const [key, refKey] of [['plant', 'gvd'], ['loop', 'loop']] as const) {
			const dev = worstDeviation(spice.freqHz, spice.responses[refKey], res.response[key], doc.plant.fsw / 2);
			expect(dev.magDb.value, describeDeviation(`${name} response.${key} magnitude`, dev.magDb, 'dB')).toBeLessThanOrEqual(0.05);
			expect(dev.phaseDeg.value, describeDeviation(`${name} response.${key} phase`, dev.phaseDeg, '°')).toBeLessThanOrEqual(0.5);
		}
	});
});
