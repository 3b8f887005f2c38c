/**
 * Engine loop gain T = Gc·Fm·Gvd·e^(−sTd) and its metrics against the outside references:
 * scipy (compensator Zf/Zi from complex impedances or node equations, averaged state-space
 * plant, crossings refined with brentq, closed-loop poles from the state matrix) within
 * 0.01 dB / 0.1°, and ngspice (op-amp network around a VCVS or single-pole op-amp, delay as a
 * matched transmission line) within 0.05 dB / 0.5° up to fsw/2 (reference/README.md, "Tolerances used by the tests").
 * The loop is assembled from the engine's public pieces: powerStage, modulatorTf, compensatorTf,
 * loopMetrics.
 */
import { describe, expect, it } from 'vitest';
import { frequencyResponse, loopMetrics, modulatorTf, multiply, powerStage } from '$lib/engine';
import { compensatorTf } from '$lib/engine/compensators/transfer';
import { bottomResistor, type NetworkParts } from '$lib/engine/synthesis/networks';
import { caseNames, describeDeviation, loadCase, loadOutput, stageInput, worstDeviation, type DesignDoc } from './referenceData';

function loopOf(doc: DesignDoc) {
	const plant = powerStage(stageInput(doc));
	const c = doc.compensator;
	const r1 = doc.feedback.r1;
	const parts = { kind: c.kind, r1, rb: bottomResistor(r1, doc.plant.vout, doc.feedback.vref), ...c.parts } as NetworkParts;
	const gc = compensatorTf(parts, c.opamp ?? null);
	const fm = modulatorTf({ vramp: doc.modulator.vramp, feedForward: doc.modulator.feedForward ?? false, delayS: doc.modulator.delay ?? 0 }, doc.plant.vin);
	return { gc, loop: multiply(gc, fm, plant.gvd) };
}

describe.each(caseNames())('loop gain %s vs references', (name) => {
	const doc = loadCase(name);
	const scipy = loadOutput('scipy', name);
	const spice = loadOutput('ngspice', name);
	const { gc, loop } = loopOf(doc);

	it('compensator and loop within 0.01 dB / 0.1° of scipy over the sweep', () => {
		const grid = Float64Array.from(scipy.freqHz);
		for (const [key, tf] of [['compensator', gc], ['loop', loop]] as const) {
			const dev = worstDeviation(scipy.freqHz, scipy.responses[key], frequencyResponse(tf, grid));
			expect(dev.magDb.value, describeDeviation(`${name} ${key} magnitude`, dev.magDb, 'dB')).toBeLessThanOrEqual(0.01);
			expect(dev.phaseDeg.value, describeDeviation(`${name} ${key} phase`, dev.phaseDeg, '°')).toBeLessThanOrEqual(0.1);
		}
	});

	it('loop within 0.05 dB / 0.5° of ngspice up to fsw/2', () => {
		const dev = worstDeviation(spice.freqHz, spice.responses.loop, frequencyResponse(loop, Float64Array.from(spice.freqHz)), doc.plant.fsw / 2);
		expect(dev.magDb.value, describeDeviation(`${name} loop magnitude`, dev.magDb, 'dB')).toBeLessThanOrEqual(0.05);
		expect(dev.phaseDeg.value, describeDeviation(`${name} loop phase`, dev.phaseDeg, '°')).toBeLessThanOrEqual(0.5);
	});

	it('every crossover, phase crossover and the closed-loop verdict match scipy', () => {
		const ref = scipy.metrics!;
		const m = loopMetrics(loop, { startHz: scipy.freqHz[0], stopHz: scipy.freqHz[scipy.freqHz.length - 1] });
		expect(m.crossovers.length, `${name}: gain crossovers`).toBe(ref.crossovers.length);
		ref.crossovers.forEach((c, i) => {
			expect(m.crossovers[i].freqHz / c.freqHz - 1, `${name}: crossover ${i} at ${c.freqHz} Hz`).toBeCloseTo(0, 7);
			expect(m.crossovers[i].phaseMarginDeg, `${name}: PM at crossover ${i} (${c.freqHz} Hz)`).toBeCloseTo(c.phaseMarginDeg, 4);
		});
		expect(m.phaseCrossovers.length, `${name}: phase crossovers`).toBe(ref.phaseCrossovers.length);
		ref.phaseCrossovers.forEach((c, i) => {
			expect(m.phaseCrossovers[i].freqHz / c.freqHz - 1, `${name}: phase crossover ${i} at ${c.freqHz} Hz`).toBeCloseTo(0, 7);
			expect(m.phaseCrossovers[i].gainMarginDb, `${name}: GM at ${c.freqHz} Hz`).toBeCloseTo(c.gainMarginDb, 4);
		});
		expect(m.phaseMarginDeg, `${name}: governing PM`).toBeCloseTo(ref.phaseMarginDeg!, 4);
		if (ref.gainMarginDb === null) expect(m.gainMarginDb, `${name}: no positive GM`).toBeNull();
		else expect(m.gainMarginDb, `${name}: GM`).toBeCloseTo(ref.gainMarginDb, 4);
		if (ref.closedLoopStable !== null) expect(m.closedLoopStable, `${name}: closed-loop stability`).toBe(ref.closedLoopStable);
	});
});
