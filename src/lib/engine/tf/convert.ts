/**
 * Conversions between factored transfer functions and polynomials / zero-pole-gain form.
 * Polynomials are ASCENDING (p[i] multiplies s^i, see math/polynomial.ts). A polynomial is
 * written c0·s^k·Π(1 − s/r_i) with c0 its lowest non-zero coefficient (docs/formulas.md §7.6).
 * ZPK follows the scipy convention k·Π(s − z)/Π(s − p).
 */
import type { Complex } from '../math/complex';
import { polyProduct, polyShift, polyScale, type Poly } from '../math/polynomial';
import { polyRoots } from '../math/roots';
import type { FactoredTf, Root } from './types';

/** Polynomial of one normalised factor: [1, 1/ω] or [1, 1/(qω0), 1/ω0²]. */
export function factorPoly(r: Root): number[] {
	if (r.kind === 'real') return [1, 1 / r.omega];
	const invQ = Number.isFinite(r.q) ? 1 / r.q : 0;
	return [1, invQ / r.omega0, 1 / (r.omega0 * r.omega0)];
}

/** The s-plane root(s) of one factor. */
export function factorRootsS(r: Root): Complex[] {
	if (r.kind === 'real') return [{ re: -r.omega, im: 0 }];
	const invQ = Number.isFinite(r.q) ? 1 / r.q : 0;
	const re = (-r.omega0 * invQ) / 2;
	const disc = 1 - invQ * invQ / 4;
	if (disc >= 0) {
		const im = r.omega0 * Math.sqrt(disc);
		return [
			{ re, im },
			{ re, im: -im }
		];
	}
	const d = r.omega0 * Math.sqrt(-disc);
	return [
		{ re: re + d, im: 0 },
		{ re: re - d, im: 0 }
	];
}

/**
 * Group s-plane roots of a real polynomial into normalised factors. Roots with |s| ≤ zeroTol
 * count as roots at the origin. Complex roots must come in conjugate pairs (polyRoots
 * guarantees it); each pair becomes one PairRoot with ω0 = |s| and q = −ω0/(2·Re s).
 */
export function rootsToFactors(roots: readonly Complex[], zeroTol = 0): { originPower: number; factors: Root[] } {
	let originPower = 0;
	const factors: Root[] = [];
	const upper: Complex[] = [];
	for (const r of roots) {
		const mag = Math.hypot(r.re, r.im);
		if (mag <= zeroTol) originPower++;
		else if (r.im === 0) factors.push({ kind: 'real', omega: -r.re });
		else if (r.im > 0) upper.push(r);
	}
	for (const r of upper) {
		const omega0 = Math.hypot(r.re, r.im);
		const q = r.re === 0 ? Infinity : -omega0 / (2 * r.re);
		factors.push({ kind: 'pair', omega0, q });
	}
	return { originPower, factors };
}

/** Lowest non-zero coefficient and its index. */
function lowestTerm(p: Poly): { k: number; c0: number } {
	for (let i = 0; i < p.length; i++) if (p[i] !== 0) return { k: i, c0: p[i] };
	throw new Error('polynomial is identically zero');
}

/** num(s)/den(s) (ascending coefficients) → factored form, via polyRoots. */
export function fromPolynomials(num: Poly, den: Poly): FactoredTf {
	const n = lowestTerm(num);
	const d = lowestTerm(den);
	const zr = polyRoots(num.slice(n.k));
	const pr = polyRoots(den.slice(d.k));
	return {
		gain: n.c0 / d.c0,
		originPower: n.k - d.k,
		zeros: rootsToFactors(zr.roots).factors,
		poles: rootsToFactors(pr.roots).factors
	};
}

export interface Polynomials {
	/** Ascending coefficients in s. */
	num: number[];
	den: number[];
}

/** Padé(n,n) approximant of e^(−s·T) as ascending polynomials (num, den). */
export function padeDelay(delayS: number, order: number): Polynomials {
	const num: number[] = [];
	const den: number[] = [];
	// c_k = (2n − k)! n! / ((2n)! k! (n − k)!)
	let c = 1;
	for (let k = 0; k <= order; k++) {
		if (k > 0) c = (c * (order - k + 1)) / (k * (2 * order - k + 1));
		const tk = c * Math.pow(delayS, k);
		den.push(tk);
		num.push(k % 2 === 0 ? tk : -tk);
	}
	return { num, den };
}

/**
 * Expand to polynomials in s (ascending). A delay is replaced by Padé(padeOrder, padeOrder)
 * (default 0 = throw if a delay is present, because a polynomial cannot carry it exactly).
 */
export function toPolynomials(tf: FactoredTf, options: { padeOrder?: number } = {}): Polynomials {
	let num = polyScale(polyProduct(tf.zeros.map(factorPoly)), tf.gain);
	let den = polyProduct(tf.poles.map(factorPoly));
	if (tf.originPower > 0) num = polyShift(num, tf.originPower);
	if (tf.originPower < 0) den = polyShift(den, -tf.originPower);
	const delay = tf.delayS ?? 0;
	if (delay !== 0) {
		const order = options.padeOrder ?? 0;
		if (order <= 0) throw new Error('toPolynomials: delay present; pass padeOrder');
		const p = padeDelay(delay, order);
		num = polyProduct([num, p.num]);
		den = polyProduct([den, p.den]);
	}
	return { num, den };
}

/** scipy-style zeros, poles, gain k of k·Π(s − z)/Π(s − p) → factored form. */
export function fromZpk(zeros: readonly Complex[], poles: readonly Complex[], k: number): FactoredTf {
	const z = rootsToFactors(zeros);
	const p = rootsToFactors(poles);
	// Π(s − r) = Π(−r) · Π(1 − s/r) over non-zero roots.
	let gain = k;
	for (const r of zeros) if (r.re !== 0 || r.im !== 0) gain *= r.im === 0 ? -r.re : r.im > 0 ? r.re * r.re + r.im * r.im : 1;
	for (const r of poles) if (r.re !== 0 || r.im !== 0) gain /= r.im === 0 ? -r.re : r.im > 0 ? r.re * r.re + r.im * r.im : 1;
	return { gain, originPower: z.originPower - p.originPower, zeros: z.factors, poles: p.factors };
}

/** Factored form → scipy-style zeros, poles (s-plane, rad/s) and gain k. */
export function toZpk(tf: FactoredTf): { zeros: Complex[]; poles: Complex[]; k: number } {
	const zeros: Complex[] = [];
	const poles: Complex[] = [];
	let k = tf.gain;
	for (let i = 0; i < tf.originPower; i++) zeros.push({ re: 0, im: 0 });
	for (let i = 0; i < -tf.originPower; i++) poles.push({ re: 0, im: 0 });
	for (const z of tf.zeros) {
		const c = factorPoly(z);
		k *= c[c.length - 1]; // leading coefficient of the normalised factor
		zeros.push(...factorRootsS(z));
	}
	for (const p of tf.poles) {
		const c = factorPoly(p);
		k /= c[c.length - 1];
		poles.push(...factorRootsS(p));
	}
	return { zeros, poles, k };
}
