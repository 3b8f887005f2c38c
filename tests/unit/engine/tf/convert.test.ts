import { describe, expect, it } from 'vitest';
import {
	evaluate,
	fromPolynomials,
	fromZpk,
	pairRoot,
	realRoot,
	toPolynomials,
	toZpk,
	type FactoredTf
} from '$lib/engine/tf';
import { polyEvalComplex } from '$lib/engine/math';

const TWO_PI = 2 * Math.PI;

const sample: FactoredTf = {
	gain: -3.5,
	originPower: -1,
	zeros: [realRoot(TWO_PI * 1e3), realRoot(-TWO_PI * 4e4), pairRoot(TWO_PI * 2e4, 2.5)],
	poles: [pairRoot(TWO_PI * 9e3, 12), realRoot(TWO_PI * 3e5), pairRoot(TWO_PI * 6e5, -0.9)]
};

function relDiff(a: { re: number; im: number }, b: { re: number; im: number }): number {
	return Math.hypot(a.re - b.re, a.im - b.im) / Math.hypot(b.re, b.im);
}

describe('polynomial conversions', () => {
	it('the factored evaluation equals direct Horner evaluation of the expanded polynomials', () => {
		// [hand-derivable: two independent evaluation paths of the same rational function]
		const { num, den } = toPolynomials(sample);
		for (const f of [3, 900, 2e4, 7e5, 3e7]) {
			const w = TWO_PI * f;
			const [nr, ni] = polyEvalComplex(num, 0, w);
			const [dr, di] = polyEvalComplex(den, 0, w);
			const d2 = dr * dr + di * di;
			const direct = { re: (nr * dr + ni * di) / d2, im: (ni * dr - nr * di) / d2 };
			expect(relDiff(evaluate(sample, w), direct)).toBeLessThan(1e-10);
		}
	});

	it('polynomials → factors → polynomials round-trips', () => {
		const { num, den } = toPolynomials(sample);
		const back = fromPolynomials(num, den);
		expect(back.originPower).toBe(-1);
		expect(back.zeros.length + back.poles.length).toBe(sample.zeros.length + sample.poles.length);
		for (const f of [10, 1e4, 1e6]) expect(relDiff(evaluate(back, TWO_PI * f), evaluate(sample, TWO_PI * f))).toBeLessThan(1e-9);
	});

	it('ZPK (scipy convention k·Π(s−z)/Π(s−p)) round-trips', () => {
		const { zeros, poles, k } = toZpk(sample);
		const back = fromZpk(zeros, poles, k);
		for (const f of [10, 1e4, 1e6]) expect(relDiff(evaluate(back, TWO_PI * f), evaluate(sample, TWO_PI * f))).toBeLessThan(1e-11);
		// a single real pole at −a with k = a is a unity-DC low-pass [hand-derivable]
		const lp = fromZpk([], [{ re: -100, im: 0 }], 100);
		expect(lp.gain).toBeCloseTo(1, 14);
		expect(lp.poles[0]).toEqual({ kind: 'real', omega: 100 });
	});

	it('a delay needs an explicit Padé order', () => {
		expect(() => toPolynomials({ ...sample, delayS: 1e-6 })).toThrow(/padeOrder/);
		const p = toPolynomials({ ...sample, delayS: 1e-6 }, { padeOrder: 2 });
		expect(p.den.length).toBe(toPolynomials(sample).den.length + 2);
	});
});
