import { describe, expect, it } from 'vitest';
import { powerStage, type PowerStageInput } from '$lib/engine/plants';
import { evaluate, evaluatePolar } from '$lib/engine/tf';
import { DesignInputError } from '$lib/engine/errors';

const TWO_PI = 2 * Math.PI;

const base: PowerStageInput = {
	topology: 'buck',
	vin: 12,
	vout: 3.3,
	iout: 5,
	fswHz: 500e3,
	l: 4.7e-6,
	dcr: 0.01,
	rdsOn: 0.008,
	capacitors: [{ c: 100e-6, esr: 0.01, esl: 0, count: 1 }]
};

// Complex helpers for the independent circuit-algebra path used below.
type C = [number, number];
const add = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const inv = (a: C): C => {
	const m = a[0] * a[0] + a[1] * a[1];
	return [a[0] / m, -a[1] / m];
};
const par = (a: C, b: C): C => inv(add(inv(a), inv(b)));
/** Impedance of the load in parallel with the capacitor branches at jω (direct circuit algebra). */
function zp(p: PowerStageInput, w: number): C {
	let y: C = [1 / (p.vout / p.iout), 0];
	for (const b of p.capacitors) {
		const zb: C = [b.esr / b.count, (w * b.esl - 1 / (w * b.c)) / b.count];
		y = add(y, inv(zb));
	}
	return inv(y);
}
const rel = (a: { re: number; im: number }, b: C) => Math.hypot(a.re - b[0], a.im - b[1]) / Math.hypot(b[0], b[1]);

describe('buck operating point', () => {
	it('duty with conduction losses, efficiency, ripple, CCM', () => {
		// [published: docs/formulas.md §1.1 (E&M ch. 3 loss model): D = V(R + r)/(Vg·R), η = R/(R + r)]
		const m = powerStage(base);
		const R = 3.3 / 5;
		const r = 0.018;
		expect(m.operatingPoint.duty).toBeCloseTo((3.3 * (R + r)) / (12 * R), 12);
		expect(m.operatingPoint.efficiency).toBeCloseTo(R / (R + r), 12);
		// [published: E&M ch. 2: ΔiL = V(1 − D)Ts/L; Δv = ΔiL/(8·fs·C)]
		const D = m.operatingPoint.duty;
		const di = (3.3 * (1 - D)) / (500e3 * 4.7e-6);
		expect(m.operatingPoint.rippleCurrent).toBeCloseTo(di, 12);
		expect(m.operatingPoint.outputRipple.capacitive).toBeCloseTo(di / (8 * 500e3 * 100e-6), 12);
		expect(m.operatingPoint.outputRipple.esr).toBeCloseTo(0.01 * di, 12);
		// [published: E&M ch. 5: Lcrit = (1 − D)·R/(2fs)]
		expect(m.operatingPoint.criticalInductance).toBeCloseTo(((1 - D) * R) / (2 * 500e3), 15);
		expect(m.operatingPoint.mode).toBe('ccm');
		expect(m.warnings).toEqual([]);
	});

	it('flags DCM when L is below the critical inductance', () => {
		// [published: E&M ch. 5, K = 2L/(R·Ts) < Kcrit = D' → DCM]
		const m = powerStage({ ...base, iout: 0.2, l: 1e-6 });
		expect(m.operatingPoint.mode).toBe('dcm');
		expect(m.warnings.map((w) => w.code)).toContain('dcm-operating-point');
	});

	it('rejects a duty of 0.95 or more, naming plant.vout', () => {
		// [contract rule: duty ≥ 0.95 rejected]
		expect(() => powerStage({ ...base, vin: 5, vout: 4.9, iout: 1 })).toThrow(DesignInputError);
		try {
			powerStage({ ...base, vin: 5, vout: 4.9, iout: 1 });
		} catch (e) {
			expect(Object.keys((e as DesignInputError).fields)).toEqual(['plant.vout']);
		}
	});
});

describe('buck small-signal model', () => {
	it('lossless limits: ω0 = 1/√(LC), Q = R√(C/L), Gd0 = Vg, |Gvd(jω0)| = Vg·Q', () => {
		// [published: E&M Table 8.2 (2nd ed.), from memory, as quoted in docs/formulas.md §1.3]
		const p = { ...base, dcr: 0, rdsOn: 0, capacitors: [{ c: 100e-6, esr: 0, esl: 0, count: 1 }] };
		const m = powerStage(p);
		const R = 3.3 / 5;
		const w0 = 1 / Math.sqrt(4.7e-6 * 100e-6);
		expect(m.features.f0Hz).toBeCloseTo(w0 / TWO_PI, 8);
		expect(m.features.q).toBeCloseTo(R * Math.sqrt(100e-6 / 4.7e-6), 12);
		expect(evaluatePolar(m.gvd, 1e-3).magDb).toBeCloseTo(20 * Math.log10(12), 9);
		expect(evaluatePolar(m.gvd, w0).magDb).toBeCloseTo(20 * Math.log10(12 * m.features.q), 9);
		expect(evaluatePolar(m.gvd, w0).phaseDeg).toBeCloseTo(-90, 9);
		expect(m.features.esrZeroHz).toEqual([]);
	});

	it('lossy closed forms of docs/formulas.md §1.2–1.3: ω0, Q, Gd0 = V/D, ESR zero', () => {
		// [derived: docs/formulas.md §1.2 exact a2, a1, a0; Gd0 = Vg·R/(R + r) = V/D]
		const m = powerStage(base);
		const R = 3.3 / 5;
		const r = 0.018;
		const Rc = 0.01;
		const L = 4.7e-6;
		const C = 100e-6;
		const a2 = L * C * (R + Rc);
		const a1 = L + C * (R * r + R * Rc + r * Rc);
		const a0 = R + r;
		expect(m.features.f0Hz).toBeCloseTo(Math.sqrt(a0 / a2) / TWO_PI, 8);
		expect(m.features.q).toBeCloseTo(Math.sqrt(a0 * a2) / a1, 12);
		expect(m.features.esrZeroHz[0]).toBeCloseTo(1 / (TWO_PI * Rc * C), 6);
		expect(evaluatePolar(m.gvd, 1e-3).magDb).toBeCloseTo(20 * Math.log10(3.3 / m.operatingPoint.duty), 9);
		// Gvg = (D/Vg)·Gvd
		const w = TWO_PI * 20e3;
		const a = evaluate(m.gvd, w);
		const b = evaluate(m.gvg, w);
		expect(b.re).toBeCloseTo((a.re * m.operatingPoint.duty) / 12, 12);
		// ZN = −(R + r)/D², ZD(0) = (R + r)/D², Zo(0) = r∥R [docs/formulas.md §1.3; hand-derivable at DC]
		const D2 = m.operatingPoint.duty ** 2;
		expect(evaluate(m.zn, w).re).toBeCloseTo(-(R + r) / D2, 10);
		expect(evaluate(m.zd, 1e-3).re).toBeCloseTo((R + r) / D2, 9);
		expect(evaluate(m.zo, 1e-3).re).toBeCloseTo((R * r) / (R + r), 9);
	});

	it('a ceramic + bulk bank with ESL matches direct circuit algebra Vg·Zp/(r + jωL + Zp)', () => {
		// [hand-derivable: averaged switch node d·Vg driving L, r and the output network]
		const p: PowerStageInput = {
			...base,
			capacitors: [
				{ c: 22e-6, esr: 0.003, esl: 0.4e-9, count: 4 },
				{ c: 330e-6, esr: 0.025, esl: 3e-9, count: 1 }
			]
		};
		const m = powerStage(p);
		const D = m.operatingPoint.duty;
		const r = 0.018;
		for (const f of [50, 3e3, 12e3, 80e3, 400e3, 2e6, 2e7]) {
			const w = TWO_PI * f;
			const z = zp(p, w);
			const series: C = [r, w * p.l];
			const gvd = mul([12, 0], mul(z, inv(add(series, z))));
			expect(rel(evaluate(m.gvd, w), gvd)).toBeLessThan(1e-9);
			expect(rel(evaluate(m.zo, w), par(series, z))).toBeLessThan(1e-9);
			expect(rel(evaluate(m.zd, w), mul(add(series, z), [1 / D ** 2, 0]))).toBeLessThan(1e-9);
		}
		// plant order grows with the branches: 2 per ESL branch in Q(s) plus L
		expect(m.gvd.poles.reduce((n, r) => n + (r.kind === 'pair' ? 2 : 1), 0)).toBe(5);
		expect(m.features.esrZeroHz.length).toBe(2);
		expect(m.features.selfResonanceHz.length).toBe(2);
	});

	it('count identical parts equal one branch with count = n, and equal branches merge', () => {
		// [hand-derivable: n parallel parts = n·C, ESR/n, ESL/n]
		const one = powerStage({ ...base, capacitors: [{ c: 47e-6, esr: 0.004, esl: 0, count: 3 }] });
		const split = powerStage({
			...base,
			capacitors: [
				{ c: 47e-6, esr: 0.004, esl: 0, count: 1 },
				{ c: 47e-6, esr: 0.004, esl: 0, count: 2 }
			]
		});
		const lumped = powerStage({ ...base, capacitors: [{ c: 141e-6, esr: 0.004 / 3, esl: 0, count: 1 }] });
		for (const f of [100, 1e4, 1e6]) {
			const a = evaluate(one.gvd, TWO_PI * f);
			expect(rel(evaluate(split.gvd, TWO_PI * f), [a.re, a.im])).toBeLessThan(1e-12);
			expect(rel(evaluate(lumped.gvd, TWO_PI * f), [a.re, a.im])).toBeLessThan(1e-12);
		}
	});
});
