/**
 * Factors an ascending real polynomial with p(0) ≠ 0 into normalised roots (tf/types.ts).
 * Degree ≤ 2 uses the closed form (ω0 = sqrt(a0/a2), Q = sqrt(a0·a2)/a1, docs/formulas.md §1.2);
 * higher degrees use polyRoots (Aberth) and group conjugate pairs.
 */
import { degree, type Poly } from '../math/polynomial';
import { polyRoots } from '../math/roots';
import { rootsToFactors } from '../tf/convert';
import { pairRoot, realRoot, type Root } from '../tf/types';

export function factorNormalised(p: Poly): Root[] {
	const n = degree(p);
	if (!(p[0] !== 0)) throw new Error('factorNormalised: p(0) must be non-zero');
	if (n <= 0) return [];
	if (n === 1) return [realRoot(p[0] / p[1])];
	if (n === 2) {
		const [a0, a1, a2] = p;
		if (a0 / a2 > 0) {
			const omega0 = Math.sqrt(a0 / a2);
			// q = sqrt(a0·a2)/a1 carries the sign of a1/a0 (negative → RHP pair)
			const q = a1 === 0 ? Infinity : (Math.sign(a0) * Math.sqrt(a0 * a2)) / a1;
			return [pairRoot(omega0, q)];
		}
	}
	const { roots } = polyRoots(p);
	return rootsToFactors(roots).factors;
}
