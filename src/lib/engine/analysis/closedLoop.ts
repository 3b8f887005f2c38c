/**
 * Closed-loop stability from the closed-loop poles, the roots of den_T + num_T (docs/formulas.md §7.3),
 * never from the margins. Polynomials are built in x = s/k (k = geometric mean of the loop's
 * corner frequencies) for conditioning. A loop delay is replaced by Padé(n,n) with the lowest
 * n in 2…8 whose phase error stays below 0.5° up to `accurateToHz` (default: the highest
 * crossover × 2); margins themselves always use the exact delay. When only the verdict is
 * needed, a Routh–Hurwitz test of the same polynomial decides "stable" without roots (an exact
 * criterion for real polynomials [published: Routh–Hurwitz, any control text; from memory]);
 * anything else (unstable, marginal, ill-conditioned) still goes to the roots.
 */
import type { Complex } from '../math/complex';
import { polyAdd, polyEvalComplex, polyProduct, polyShift, degree } from '../math/polynomial';
import { polyRoots } from '../math/roots';
import { padeDelay } from '../tf/convert';
import type { FactoredTf, Root } from '../tf/types';

export interface ClosedLoopResult {
	/** true: every pole has Re < 0; false: some pole on or right of the axis; null: not decidable. */
	stable: boolean | null;
	/** Closed-loop poles, rad/s. */
	poles: Complex[];
	/** Padé order used for the delay (0 without delay). */
	padeOrder: number;
	/** 'roots': from the poles; 'routh': stable by Routh–Hurwitz, poles not computed (empty). */
	method: 'roots' | 'routh';
	reason?: string;
}

/**
 * Routh–Hurwitz test of a real polynomial (ascending coefficients): true when every coefficient
 * has the leading coefficient's sign and every first-column entry is positive by more than 1e-8
 * of the terms it was computed from (so cancellation cannot have made it so), i.e. all roots
 * clearly in the open left half plane; null when the test cannot say so (unstable, marginal or
 * ill-conditioned: use the roots).
 */
export function routhHurwitzStable(ascending: readonly number[]): true | null {
	const n = ascending.length - 1;
	if (n < 1) return null;
	const lead = ascending[n];
	if (!(lead !== 0)) return null;
	const sign = lead > 0 ? 1 : -1;
	for (let i = 0; i <= n; i++) if (!(sign * ascending[i] > 0)) return null;
	// Two rows of the array at a time, highest power first: r0 = a_n, a_{n−2}, …; r1 = a_{n−1}, a_{n−3}, ….
	const width = (n >> 1) + 2;
	let r0 = new Float64Array(width);
	let r1 = new Float64Array(width);
	let next = new Float64Array(width);
	for (let i = 0; i <= n; i++) {
		const v = sign * ascending[n - i];
		if (i % 2 === 0) r0[i >> 1] = v;
		else r1[i >> 1] = v;
	}
	for (let row = 2; row <= n; row++) {
		const p = r1[0];
		const ratio = r0[0] / p;
		for (let j = 0; j + 1 < width; j++) next[j] = r0[j + 1] - ratio * r1[j + 1];
		next[width - 1] = 0;
		if (!(next[0] > 1e-8 * (Math.abs(r0[1]) + Math.abs(ratio * r1[1])))) return null;
		const t = r0;
		r0 = r1;
		r1 = next;
		next = t;
	}
	return true;
}

const rootMag = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0);

/** Π of the factors in x = s/k (ascending), multiplied in place: [1, k/ω] or [1, x/q, x²] with x = k/ω0. */
function expandScaled(roots: readonly Root[], k: number, scale: number): number[] {
	const p: number[] = [scale];
	for (const r of roots) {
		if (r.kind === 'real') {
			const a = k / r.omega;
			p.push(0);
			for (let i = p.length - 1; i >= 1; i--) p[i] += a * p[i - 1];
			continue;
		}
		const invQ = Number.isFinite(r.q) ? 1 / r.q : 0;
		const x = k / r.omega0;
		const a = invQ * x;
		const b = x * x;
		p.push(0, 0);
		for (let i = p.length - 1; i >= 2; i--) p[i] += a * p[i - 1] + b * p[i - 2];
		p[1] += a * p[0];
	}
	return p;
}

/** Phase error (deg) of Padé(n,n) for e^(−jx) at x = ω·Td. */
function padePhaseErrorDeg(order: number, x: number): number {
	const p = padeDelay(1, order);
	const [dr, di] = polyEvalComplex(p.den, 0, x);
	// num(jx) = conj(den(jx)), so the phase is −2·arg den(jx); compare with −x, wrapped.
	let e = -2 * Math.atan2(di, dr) + x;
	e -= 2 * Math.PI * Math.round(e / (2 * Math.PI));
	return Math.abs((e * 180) / Math.PI);
}

export function choosePadeOrder(delayS: number, accurateToHz: number): number {
	const x = 2 * Math.PI * accurateToHz * delayS;
	for (let n = 2; n <= 8; n++) if (padePhaseErrorDeg(n, x) < 0.5) return n;
	return 8;
}

export function closedLoopStability(
	loop: FactoredTf,
	options: {
		padeOrder?: number;
		accurateToHz?: number;
		/** The poles are wanted [true]; false allows the Routh–Hurwitz shortcut for a stable loop. */
		poles?: boolean;
	} = {}
): ClosedLoopResult {
	const delay = loop.delayS ?? 0;
	// k = geometric mean of the corner frequencies (and 1/Td).
	let logSum = 0;
	let count = 0;
	for (const list of [loop.zeros, loop.poles]) {
		for (const r of list) {
			const w = rootMag(r);
			if (w > 0 && Number.isFinite(w)) {
				logSum += Math.log(w);
				count++;
			}
		}
	}
	if (delay > 0) {
		logSum += Math.log(1 / delay);
		count++;
	}
	const k = count ? Math.exp(logSum / count) : 1;

	let num = expandScaled(loop.zeros, k, loop.gain * Math.pow(k, loop.originPower));
	let den = expandScaled(loop.poles, k, 1);
	if (loop.originPower > 0) num = polyShift(num, loop.originPower);
	if (loop.originPower < 0) den = polyShift(den, -loop.originPower);
	let padeOrder = 0;
	if (delay > 0) {
		padeOrder = options.padeOrder ?? choosePadeOrder(delay, options.accurateToHz ?? 1 / delay);
		const p = padeDelay(k * delay, padeOrder);
		num = polyProduct([num, p.num]);
		den = polyProduct([den, p.den]);
	}
	const ch = polyAdd(den, num);
	const n = degree(ch);
	if (n < 0) return { stable: null, poles: [], padeOrder, method: 'roots', reason: '1 + T is identically zero' };
	// An improper cancellation (T(∞) = −1) lowers the degree: poles have gone to infinity.
	const nd = degree(den);
	if (n < Math.max(nd, degree(num))) {
		return { stable: null, poles: [], padeOrder, method: 'roots', reason: '1 + T loses degree at s → ∞ (T(∞) = −1)' };
	}
	if (!ch.every(Number.isFinite)) return { stable: null, poles: [], padeOrder, method: 'roots', reason: 'non-finite characteristic polynomial' };
	if (options.poles === false && routhHurwitzStable(ch.slice(0, n + 1)) === true) return { stable: true, poles: [], padeOrder, method: 'routh' };
	const r = polyRoots(ch);
	const poles = r.roots;
	let stable = true;
	for (const p of poles) {
		p.re *= k;
		p.im *= k;
		if (!(p.re < -1e-12 * Math.sqrt(p.re * p.re + p.im * p.im))) stable = false;
	}
	if (!(r.backwardError < 1e-8)) {
		return { stable: null, poles, padeOrder, method: 'roots', reason: `closed-loop poles inaccurate (backward error ${r.backwardError.toExponential(1)})` };
	}
	return { stable, poles, padeOrder, method: 'roots' };
}
