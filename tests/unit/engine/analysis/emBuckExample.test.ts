/**
 * The buck design example of Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed.,
 * ch. 9 (§9.5.4, PD + PI compensator). All inputs and the book's figures are FROM MEMORY:
 * Vg = 28 V, V = 15 V, R = 3 Ω, L = 50 µH, C = 500 µF, fs = 100 kHz, VM = 4 V, H = 1/3;
 * f0 ≈ 1 kHz, Q0 ≈ 9.5 (19.5 dB), Tu0 = H·Gd0/VM ≈ 2.33 (7.4 dB); fc = 5 kHz (fs/20),
 * lead for 52°: fz ≈ 1.7 kHz, fp ≈ 14.5 kHz, Gc0 ≈ 3.7 (11.3 dB), PI zero fL = 500 Hz.
 */
import { describe, expect, it } from 'vitest';
import { loopMetrics } from '$lib/engine/analysis';
import { powerStage } from '$lib/engine/plants';
import { evaluatePolar, multiply, realRoot, type FactoredTf } from '$lib/engine/tf';

const TWO_PI = 2 * Math.PI;

describe('E&M ch. 9 buck design example (from memory)', () => {
	const plant = powerStage({
		topology: 'buck',
		vin: 28,
		vout: 15,
		iout: 5,
		fswHz: 100e3,
		l: 50e-6,
		dcr: 0,
		rdsOn: 0,
		capacitors: [{ c: 500e-6, esr: 0, esl: 0, count: 1 }]
	});

	it('power-stage features: f0 ≈ 1 kHz, Q ≈ 9.5 (19.5 dB), Gd0 = 28 V, Tu0 ≈ 2.33', () => {
		// [published: E&M §9.5.4, from memory]
		expect(plant.features.f0Hz).toBeGreaterThan(1000);
		expect(plant.features.f0Hz).toBeLessThan(1010);
		expect(plant.features.q).toBeCloseTo(9.5, 1); // 19.5 dB
		expect(evaluatePolar(plant.gvd, 1).magDb).toBeCloseTo(20 * Math.log10(28), 6);
		expect(((1 / 3) * 28) / 4).toBeCloseTo(2.33, 2);
	});

	it('PD + PI compensator: crossover ≈ 5 kHz, PM ≈ 52° minus the PI cost, no GM, stable', () => {
		// [published: E&M §9.5.4 values from memory; expected PM derived here:
		//  52° lead − atan(fL/fc) = 5.71° (docs/formulas.md §6.4) + 1.3° (plant phase −178.7° at 5 f0, Q 9.5)]
		const wL = TWO_PI * 500;
		const gc: FactoredTf = { gain: 3.7 * wL, originPower: -1, zeros: [realRoot(wL), realRoot(TWO_PI * 1.7e3)], poles: [realRoot(TWO_PI * 14.5e3)] };
		const loop = multiply(gc, plant.gvd, { gain: 1 / 3 / 4, originPower: 0, zeros: [], poles: [] });
		const m = loopMetrics(loop, { startHz: 1, stopHz: 1e6 });
		expect(m.crossovers.length).toBe(1);
		expect(Math.abs(m.crossoverHz! / 5e3 - 1)).toBeLessThan(0.06);
		expect(m.phaseMarginDeg!).toBeGreaterThan(45);
		expect(m.phaseMarginDeg!).toBeLessThan(50);
		expect(m.gainMarginDb).toBeNull();
		expect(m.closedLoopStable).toBe(true);
	});
});
