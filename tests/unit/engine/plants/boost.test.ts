import { describe, expect, it } from 'vitest';
import { powerStage, type PowerStageInput } from '$lib/engine/plants';
import { evaluate, evaluatePolar } from '$lib/engine/tf';
import { DesignInputError } from '$lib/engine/errors';

const TWO_PI = 2 * Math.PI;

const base: PowerStageInput = {
	topology: 'boost',
	vin: 5,
	vout: 12,
	iout: 1,
	fswHz: 400e3,
	l: 10e-6,
	dcr: 0.03,
	rdsOn: 0.02,
	capacitors: [{ c: 47e-6, esr: 0.005, esl: 0, count: 2 }]
};

describe('boost operating point (DC transformer with inductor resistance)', () => {
	it('duty reproduces M(D) = (1/D′)·1/(1 + r/(D′²R)) and η = 1/(1 + r/(D′²R))', () => {
		// [published: E&M ch. 3, boost with inductor winding resistance]
		const m = powerStage(base);
		const R = 12;
		const r = 0.05;
		const Dc = 1 - m.operatingPoint.duty;
		expect((1 / Dc) * (1 / (1 + r / (Dc * Dc * R)))).toBeCloseTo(12 / 5, 12);
		expect(m.operatingPoint.efficiency).toBeCloseTo(1 / (1 + r / (Dc * Dc * R)), 12);
		// Energy balance: Pin = Vg·IL, Pout = V²/R [hand-derivable]
		expect(m.operatingPoint.efficiency).toBeCloseTo((12 * 12) / R / (5 * m.operatingPoint.inductorCurrent), 12);
		// DC gain of the line-to-output response equals V/Vg [docs/formulas.md §2.3]
		expect(evaluatePolar(m.gvg, 1e-3).magDb).toBeCloseTo(20 * Math.log10(12 / 5), 9);
		// [published: E&M ch. 2: boost ΔiL = Vg·D·Ts/L; capacitor ripple V·D/(R·C·fs)]
		const D = m.operatingPoint.duty;
		expect(m.operatingPoint.rippleCurrent).toBeCloseTo((5 * D) / (400e3 * 10e-6), 12);
		expect(m.operatingPoint.outputRipple.capacitive).toBeCloseTo((12 * D) / (R * 94e-6 * 400e3), 12);
		// [published: E&M ch. 5: Lcrit = D·D′²·R/(2fs)]
		expect(m.operatingPoint.criticalInductance).toBeCloseTo((D * Dc * Dc * R) / (2 * 400e3), 15);
	});

	it('lossless: Gd0 = Vg/D′², ωrhp = D′²R/L, ω0 = D′/√(LC), Q = D′R√(C/L)', () => {
		// [published: E&M Table 8.2 (2nd ed.), from memory, as quoted in docs/formulas.md §2.3]
		const m = powerStage({ ...base, dcr: 0, rdsOn: 0, capacitors: [{ c: 94e-6, esr: 0, esl: 0, count: 1 }] });
		const Dc = 5 / 12;
		expect(1 - m.operatingPoint.duty).toBeCloseTo(Dc, 12);
		expect(evaluatePolar(m.gvd, 1e-3).magDb).toBeCloseTo(20 * Math.log10(5 / (Dc * Dc)), 9);
		expect(m.features.rhpZeroHz).toBeCloseTo((Dc * Dc * 12) / (TWO_PI * 10e-6), 6);
		expect(m.features.f0Hz).toBeCloseTo(Dc / Math.sqrt(10e-6 * 94e-6) / TWO_PI, 8);
		expect(m.features.q).toBeCloseTo(Dc * 12 * Math.sqrt(94e-6 / 10e-6), 10);
	});

	it('the RHP zero adds lag: phase runs to −270° with no ESR, magnitude rises again', () => {
		// [hand-derivable: pair −180°, RHP zero −90°]
		const m = powerStage({ ...base, capacitors: [{ c: 94e-6, esr: 0, esl: 0, count: 1 }] });
		const wz = TWO_PI * m.features.rhpZeroHz!;
		expect(evaluatePolar(m.gvd, 1e4 * wz).phaseDeg).toBeCloseTo(-270, 1);
		// [derived: docs/formulas.md §2.3 exact lossy forms; RHP zero at (D′²R − r)/L]
		const Dc = 1 - m.operatingPoint.duty;
		expect(m.features.rhpZeroHz).toBeCloseTo((Dc * Dc * 12 - 0.05) / (TWO_PI * 10e-6), 6);
	});

	it('matches direct circuit algebra with a two-branch bank', () => {
		// [hand-derivable: linearised averaged boost, Gvd = Zp·(V·D′ − (r + sL)·IL)/(D′²Zp + r + sL)]
		const p: PowerStageInput = {
			...base,
			capacitors: [
				{ c: 10e-6, esr: 0.002, esl: 0.5e-9, count: 3 },
				{ c: 220e-6, esr: 0.04, esl: 0, count: 1 }
			]
		};
		const m = powerStage(p);
		const Dc = 1 - m.operatingPoint.duty;
		const IL = m.operatingPoint.inductorCurrent;
		for (const f of [30, 2e3, 9e3, 60e3, 300e3, 5e6]) {
			const w = TWO_PI * f;
			// Zp by hand: 1/(1/R + Σ 1/Zb)
			let yr = 1 / 12;
			let yi = 0;
			for (const b of p.capacitors) {
				const zr = b.esr / b.count;
				const zi = (w * b.esl - 1 / (w * b.c)) / b.count;
				const mm = zr * zr + zi * zi;
				yr += zr / mm;
				yi -= zi / mm;
			}
			const ym = yr * yr + yi * yi;
			const Zp = { re: yr / ym, im: -yi / ym };
			const nr = 12 * Dc - 0.05 * IL;
			const ni = -w * 10e-6 * IL;
			const num = { re: Zp.re * nr - Zp.im * ni, im: Zp.re * ni + Zp.im * nr };
			const den = { re: Dc * Dc * Zp.re + 0.05, im: Dc * Dc * Zp.im + w * 10e-6 };
			const dm = den.re * den.re + den.im * den.im;
			const gvd = { re: (num.re * den.re + num.im * den.im) / dm, im: (num.im * den.re - num.re * den.im) / dm };
			const got = evaluate(m.gvd, w);
			expect(Math.hypot(got.re - gvd.re, got.im - gvd.im) / Math.hypot(gvd.re, gvd.im)).toBeLessThan(1e-9);
		}
		// ZN = −(D′²R − r − sL), independent of the bank [docs/formulas.md §2.3]
		const w = TWO_PI * 1e4;
		const zn = evaluate(m.zn, w);
		expect(zn.re).toBeCloseTo(-(Dc * Dc * 12 - 0.05), 9);
		expect(zn.im).toBeCloseTo(w * 10e-6, 9);
	});

	it('rejects a vout beyond the maximum gain ½·√(R/r), naming plant.vout', () => {
		// [derived: docs/formulas.md §2.1, max V/Vg = ½√(R/r) at D′ = √(r/R)]
		const p = { ...base, dcr: 0.5, rdsOn: 0, vout: 30, iout: 1 }; // R = 30, max V = 2.5·√60 ≈ 19.4 V
		expect(() => powerStage(p)).toThrow(DesignInputError);
		try {
			powerStage(p);
		} catch (e) {
			const msg = (e as DesignInputError).fields['plant.vout'];
			expect(msg).toMatch(/maximum gain/);
			expect(msg).toContain((0.5 * 5 * Math.sqrt(30 / 0.5)).toPrecision(4));
		}
		// just inside the limit it works
		expect(() => powerStage({ ...p, vout: 19, iout: 19 / 30 })).not.toThrow();
	});
});
