import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { closedLoopStability, loopMetrics, routhHurwitzStable } from '$lib/engine/analysis';
import { polyProduct } from '$lib/engine/math';
import { pairRoot, realRoot, type FactoredTf } from '$lib/engine/tf';

/** Ascending coefficients of Π(s − r) over real roots and conjugate pairs (re ± j·im). */
function fromRoots(real: number[], pairs: { re: number; im: number }[]): number[] {
	const f: number[][] = real.map((r) => [-r, 1]);
	for (const p of pairs) f.push([p.re * p.re + p.im * p.im, -2 * p.re, 1]);
	return polyProduct(f);
}

describe('Routh–Hurwitz shortcut for the stability verdict', () => {
	it('says stable exactly for polynomials built from left-half-plane roots, never for others', () => {
		// [hand-derivable: polynomials built from known roots; Routh–Hurwitz, any control text]
		const root = fc.record({
			logMag: fc.double({ min: -2, max: 2, noNaN: true }),
			// angle from the negative real axis, up to 80°
			angle: fc.double({ min: 0, max: 1.4, noNaN: true }),
			pair: fc.boolean(),
			rhp: fc.boolean()
		});
		fc.assert(
			fc.property(fc.array(root, { minLength: 1, maxLength: 6 }), (spec) => {
				const real: number[] = [];
				const pairs: { re: number; im: number }[] = [];
				for (const r of spec) {
					const m = Math.pow(10, r.logMag);
					const re = -m * Math.cos(r.angle) * (r.rhp ? -1 : 1);
					if (r.pair) pairs.push({ re, im: m * Math.sin(r.angle) });
					else real.push(re);
				}
				const stable = spec.every((r) => !r.rhp);
				const verdict = routhHurwitzStable(fromRoots(real, pairs));
				if (!stable) expect(verdict).toBeNull();
				// Clearly stable sets (every root at least 10° from the jω axis) must be recognised.
				else expect(verdict).toBe(true);
			}),
			{ numRuns: 500, seed: 31 }
		);
	});

	it('leaves a pair on the jω axis and a root at the origin to the root finder', () => {
		// [hand-derivable: s² + 1 and s(s + 1) are not Hurwitz]
		expect(routhHurwitzStable([1, 0, 1])).toBeNull();
		expect(routhHurwitzStable([0, 1, 1])).toBeNull();
		expect(routhHurwitzStable(fromRoots([-1, -2], [{ re: -1e-13, im: 1 }]))).toBeNull();
	});

	it('gives the same verdict as the closed-loop poles on conditionally stable and unstable loops', () => {
		// [published: Routh–Hurwitz; K(1 + s)²/(s³(1 + s/10)²) flips with K, see margins.test.ts]
		for (const K of [0.2, 0.6, 1, 2, 4, 8, 15, 30, 60]) {
			const loop: FactoredTf = { gain: K, originPower: -3, zeros: [realRoot(1), realRoot(1)], poles: [realRoot(10), realRoot(10)] };
			const byRoots = closedLoopStability(loop);
			const byVerdict = closedLoopStability(loop, { poles: false });
			expect(byVerdict.stable, `K = ${K}`).toBe(byRoots.stable);
			if (byVerdict.method === 'routh') expect(byVerdict.poles).toEqual([]);
		}
		// A resonant plant with delay (Padé) keeps its verdict too.
		const delayed: FactoredTf = { gain: 2e4, originPower: -1, zeros: [], poles: [pairRoot(2e5, 3)], delayS: 2e-6 };
		const m1 = loopMetrics(delayed, { startHz: 1, stopHz: 1e7 });
		const m2 = loopMetrics(delayed, { startHz: 1, stopHz: 1e7 }, { closedLoopPoles: false });
		expect(m2.closedLoopStable).toBe(m1.closedLoopStable);
	});
});
