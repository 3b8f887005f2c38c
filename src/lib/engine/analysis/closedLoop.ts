/**
 * Closed-loop stability from the closed-loop poles, the roots of den_T + num_T (formulas §7.3),
 * never from the margins. Polynomials are built in x = s/k (k = geometric mean of the loop's
 * corner frequencies) for conditioning. A loop delay is replaced by Padé(n,n) with the lowest
 * n in 2…8 whose phase error stays below 0.5° up to `accurateToHz` (default: the highest
 * crossover × 2); margins themselves always use the exact delay.
 */
import type { Complex } from '../math/complex';
import { polyAdd, polyEvalComplex, polyProduct, polyScale, polyShift, degree } from '../math/polynomial';
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
	reason?: string;
}

const rootMag = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0);

function factorPolyScaled(r: Root, k: number): number[] {
	if (r.kind === 'real') return [1, k / r.omega];
	const invQ = Number.isFinite(r.q) ? 1 / r.q : 0;
	const x = k / r.omega0;
	return [1, invQ * x, x * x];
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
	options: { padeOrder?: number; accurateToHz?: number } = {}
): ClosedLoopResult {
	const roots = [...loop.zeros, ...loop.poles];
	const delay = loop.delayS ?? 0;
	const scales = roots.map(rootMag).filter((w) => w > 0 && Number.isFinite(w));
	if (delay > 0) scales.push(1 / delay);
	const k = scales.length ? Math.exp(scales.reduce((a, w) => a + Math.log(w), 0) / scales.length) : 1;

	let num = polyScale(polyProduct(loop.zeros.map((r) => factorPolyScaled(r, k))), loop.gain * Math.pow(k, loop.originPower));
	let den = polyProduct(loop.poles.map((r) => factorPolyScaled(r, k)));
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
	if (n < 0) return { stable: null, poles: [], padeOrder, reason: '1 + T is identically zero' };
	// An improper cancellation (T(∞) = −1) lowers the degree: poles have gone to infinity.
	const nd = degree(den);
	if (n < Math.max(nd, degree(num))) {
		return { stable: null, poles: [], padeOrder, reason: '1 + T loses degree at s → ∞ (T(∞) = −1)' };
	}
	if (!ch.every(Number.isFinite)) return { stable: null, poles: [], padeOrder, reason: 'non-finite characteristic polynomial' };
	const r = polyRoots(ch);
	const poles = r.roots.map((z) => ({ re: z.re * k, im: z.im * k }));
	if (!(r.backwardError < 1e-8)) {
		return { stable: null, poles, padeOrder, reason: `closed-loop poles inaccurate (backward error ${r.backwardError.toExponential(1)})` };
	}
	const stable = poles.every((p) => p.re < -1e-12 * Math.hypot(p.re, p.im));
	return { stable, poles, padeOrder };
}
