import { describe, expect, it } from 'vitest';
import {
	constantTf,
	evaluatePolar,
	frequencyResponse,
	fromPolynomials,
	multiply,
	padeDelay,
	pairRoot,
	realRoot,
	type FactoredTf
} from '$lib/engine/tf';
import { logGrid } from '$lib/engine/sweep';

const TWO_PI = 2 * Math.PI;

describe('factor evaluation at the corner', () => {
	it('an ESR zero gives +45° and +3.01 dB at its corner', () => {
		// [hand-derivable: |1 + j| = √2 → 3.0103 dB, arg = 45°]
		const w = TWO_PI * 1.7e6;
		const tf: FactoredTf = { gain: 1, originPower: 0, zeros: [realRoot(w)], poles: [] };
		const r = evaluatePolar(tf, w);
		expect(r.phaseDeg).toBeCloseTo(45, 10);
		expect(r.magDb).toBeCloseTo(20 * Math.log10(Math.SQRT2), 10);
	});

	it('a RHP zero gives −45° and +3.01 dB at its corner', () => {
		// [hand-derivable: 1 − j → |·| = √2, arg = −45°]
		const w = TWO_PI * 20e3;
		const r = evaluatePolar({ gain: 1, originPower: 0, zeros: [realRoot(-w)], poles: [] }, w);
		expect(r.phaseDeg).toBeCloseTo(-45, 10);
		expect(r.magDb).toBeCloseTo(3.0103, 4);
	});

	it('a complex pole pair gives |H| = Q and −90° at ω0', () => {
		// [hand-derivable: 1/(1 + j/Q) at ω = ω0... the s² term cancels the 1, leaving 1/(j/Q)]
		for (const q of [0.3, 0.707, 5, 200]) {
			const w0 = TWO_PI * 13e3;
			const r = evaluatePolar({ gain: 1, originPower: 0, zeros: [], poles: [pairRoot(w0, q)] }, w0);
			expect(r.magDb).toBeCloseTo(20 * Math.log10(q), 9);
			expect(r.phaseDeg).toBeCloseTo(-90, 9);
		}
	});

	it('an integrator is −90° at every frequency and 0 dB at ωI', () => {
		// [hand-derivable: ωI/(jω)]
		const wI = 5e3;
		const tf: FactoredTf = { gain: wI, originPower: -1, zeros: [], poles: [] };
		for (const w of [1, wI, 1e7]) expect(evaluatePolar(tf, w).phaseDeg).toBeCloseTo(-90, 12);
		expect(evaluatePolar(tf, wI).magDb).toBeCloseTo(0, 12);
		expect(evaluatePolar(tf, 10 * wI).magDb).toBeCloseTo(-20, 10);
	});

	it('a negative gain adds +180° (docs/formulas.md §7.6)', () => {
		expect(evaluatePolar(constantTf(-2), 1).phaseDeg).toBeCloseTo(180, 12);
	});
});

describe('unwrapped phase', () => {
	it('three high-Q pole pairs run continuously to −540° with no jump', () => {
		// [hand-derivable: each pair contributes 0 → −180° monotonically]
		const tf: FactoredTf = {
			gain: 1,
			originPower: 0,
			zeros: [],
			poles: [pairRoot(TWO_PI * 1e3, 50), pairRoot(TWO_PI * 1e4, 80), pairRoot(TWO_PI * 1e5, 30)]
		};
		const r = frequencyResponse(tf, logGrid(1, 1e8, 4001));
		let maxStep = 0;
		for (let i = 1; i < r.phaseDeg.length; i++) {
			expect(r.phaseDeg[i]).toBeLessThanOrEqual(r.phaseDeg[i - 1] + 1e-12);
			maxStep = Math.max(maxStep, r.phaseDeg[i - 1] - r.phaseDeg[i]);
		}
		expect(maxStep).toBeLessThan(180);
		expect(r.phaseDeg[0]).toBeCloseTo(0, 2);
		expect(r.phaseDeg[r.phaseDeg.length - 1]).toBeCloseTo(-540, 0);
	});

	it('a RHP pole pair runs from 0 to +180°', () => {
		// [hand-derivable: factor 1 − s/(|Q|ω0) + s²/ω0² has phase 0 → −180°, as a pole +180°]
		const tf: FactoredTf = { gain: 1, originPower: 0, zeros: [], poles: [pairRoot(1e3, -4)] };
		expect(evaluatePolar(tf, 1e-2).phaseDeg).toBeCloseTo(0, 3);
		expect(evaluatePolar(tf, 1e3).phaseDeg).toBeCloseTo(90, 9);
		expect(evaluatePolar(tf, 1e8).phaseDeg).toBeCloseTo(180, 3);
	});

	it('stays finite over 14 decades with 12 poles (no overflow in the magnitude)', () => {
		const poles = Array.from({ length: 6 }, () => pairRoot(1, 0.7));
		const tf = multiply({ gain: 1, originPower: 0, zeros: [], poles }, constantTf(1));
		const r = frequencyResponse(tf, logGrid(1e-3, 1e11, 50));
		for (const v of r.magDb) expect(Number.isFinite(v)).toBe(true);
		// 12th-order roll-off: −240 dB/decade [hand-derivable]
		const a = evaluatePolar(tf, 1e9).magDb;
		const b = evaluatePolar(tf, 1e10).magDb;
		expect(a - b).toBeCloseTo(240, 6);
	});
});

describe('delay', () => {
	it('is evaluated exactly: −36° at 100 kHz for 1 µs, magnitude 1', () => {
		// [docs/formulas.md §3 check values, computed there]
		const tf: FactoredTf = { gain: 1, originPower: 0, zeros: [], poles: [], delayS: 1e-6 };
		const r = evaluatePolar(tf, TWO_PI * 100e3);
		expect(r.phaseDeg).toBeCloseTo(-36, 10);
		expect(r.magDb).toBe(0);
		expect(evaluatePolar(tf, TWO_PI * 200e3).phaseDeg).toBeCloseTo(-72, 10);
	});

	it('Padé(1,1) and (2,2) match the formula-sheet phases at 100 and 200 kHz', () => {
		// [docs/formulas.md §3: P11 −34.881° / −64.284°, P22 −35.992° / −71.774° for Td = 1 µs]
		const p1 = padeDelay(1e-6, 1);
		const p2 = padeDelay(1e-6, 2);
		const t1 = fromPolynomials(p1.num, p1.den);
		const t2 = fromPolynomials(p2.num, p2.den);
		expect(evaluatePolar(t1, TWO_PI * 100e3).phaseDeg).toBeCloseTo(-34.881, 3);
		expect(evaluatePolar(t1, TWO_PI * 200e3).phaseDeg).toBeCloseTo(-64.284, 3);
		expect(evaluatePolar(t2, TWO_PI * 100e3).phaseDeg).toBeCloseTo(-35.992, 3);
		expect(evaluatePolar(t2, TWO_PI * 200e3).phaseDeg).toBeCloseTo(-71.774, 3);
		expect(evaluatePolar(t2, TWO_PI * 200e3).magDb).toBeCloseTo(0, 10);
	});
});
