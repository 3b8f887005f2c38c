import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { polyProduct, polyRoots, type Complex } from '$lib/engine/math';

const TWO_PI = 2 * Math.PI;

/** Expand Π(s − r) for a conjugate-closed root list given as reals and upper-half pairs. */
function build(real: number[], pairs: Complex[]): number[] {
	const f: number[][] = real.map((r) => [-r, 1]);
	for (const p of pairs) f.push([p.re * p.re + p.im * p.im, -2 * p.re, 1]);
	return polyProduct(f);
}

/** For each expected root, relative distance to the nearest computed root. */
function worstMatch(expected: Complex[], got: Complex[]): number {
	let worst = 0;
	for (const e of expected) {
		let best = Infinity;
		for (const g of got) best = Math.min(best, Math.hypot(g.re - e.re, g.im - e.im) / Math.hypot(e.re, e.im));
		worst = Math.max(worst, best);
	}
	return worst;
}

const expand = (real: number[], pairs: Complex[]): Complex[] => [
	...real.map((re) => ({ re, im: 0 })),
	...pairs.flatMap((p) => [p, { re: p.re, im: -p.im }])
];

describe('polyRoots', () => {
	it('finds 12 roots spread over 5 decades, with RHP roots, to 1e-9 relative', () => {
		// [hand-derivable: polynomial built from known roots; poles 2π·10 … 2π·1e6 as in stack-notes]
		const real = [-TWO_PI * 10, -TWO_PI * 1e6, TWO_PI * 3e4, -TWO_PI * 470];
		const pairs: Complex[] = [
			{ re: -TWO_PI * 100, im: TWO_PI * 5e3 },
			{ re: -TWO_PI * 4e4, im: TWO_PI * 3e4 },
			{ re: TWO_PI * 800, im: TWO_PI * 2.2e3 },
			{ re: -TWO_PI * 2e3, im: TWO_PI * 2.5e5 }
		];
		const p = build(real, pairs);
		expect(p.length - 1).toBe(12);
		const r = polyRoots(p);
		expect(r.roots.length).toBe(12);
		expect(r.backwardError).toBeLessThan(1e-13);
		expect(worstMatch(expand(real, pairs), r.roots)).toBeLessThan(1e-9);
		// exact conjugate symmetry: as many upper as lower roots
		expect(r.roots.filter((z) => z.im > 0).length).toBe(r.roots.filter((z) => z.im < 0).length);
	});

	it('returns roots at the origin exactly and handles a triple root', () => {
		// [hand-derivable; a triple root is only determined to about eps^(1/3) ≈ 6e-6]
		const p = [0, 0, ...build([-1e4, -1e4, -1e4, -5], [])];
		const r = polyRoots(p);
		expect(r.roots.filter((z) => z.re === 0 && z.im === 0).length).toBe(2);
		expect(worstMatch([{ re: -1e4, im: 0 }, { re: -5, im: 0 }], r.roots)).toBeLessThan(1e-4);
		expect(r.backwardError).toBeLessThan(1e-12);
	});

	it('property: random real/complex root sets up to degree 12 come back with tiny backward error', () => {
		const rootArb = fc.record({
			logMag: fc.double({ min: 0, max: 7, noNaN: true }),
			angle: fc.double({ min: 0.05, max: Math.PI - 0.05, noNaN: true }),
			complexRoot: fc.boolean()
		});
		fc.assert(
			fc.property(fc.array(rootArb, { minLength: 1, maxLength: 6 }), (spec) => {
				const real: number[] = [];
				const pairs: Complex[] = [];
				for (const s of spec) {
					const m = Math.pow(10, s.logMag);
					if (s.complexRoot) pairs.push({ re: m * Math.cos(s.angle), im: m * Math.sin(s.angle) });
					else real.push(-m * Math.cos(s.angle) * 2);
				}
				const p = build(real, pairs);
				const r = polyRoots(p);
				expect(r.roots.length).toBe(p.length - 1);
				expect(r.backwardError).toBeLessThan(1e-10);
			}),
			{ numRuns: 200 }
		);
	});
});
