/**
 * Closed-loop transfer functions X/(1 + T) in factored form (docs/formulas.md §8.1, §8.2): with
 * T = nT/dT, X/(1 + T) = X·dT/(dT + nT). X's poles cancel against the matching poles of dT
 * exactly (the plant's Δ is shared by Gvd, Gvg and Zo), so Zo,cl = Zo·dc/(dc·Δ + Fm·nc·ng).
 * The characteristic polynomial dT + nT is built in x = s/k for conditioning and factored
 * with the engine's root finder. A loop delay becomes Padé(n,n) here (time domain only).
 */
import { choosePadeOrder } from '../analysis/closedLoop';
import type { Complex } from '../math/complex';
import { degree, polyAdd, polyProduct, polyScale, polyShift } from '../math/polynomial';
import { polyRoots } from '../math/roots';
import { cancelCommon, multiply } from '../tf/algebra';
import { padeDelay, rootsToFactors } from '../tf/convert';
import type { FactoredTf, Root } from '../tf/types';

export interface ClosedLoopDenominator {
	/** Factors of the characteristic polynomial dT + nT, normalised to 1 at s = 0. */
	poles: Root[];
	/** Closed-loop poles in the s-plane, rad/s. */
	polesS: Complex[];
	/** Closed-loop poles at the origin (normally 0). */
	originPoles: number;
	/** Lowest non-zero coefficient of dT + nT in s (its value at s = 0 when originPoles = 0). */
	lowestCoefficient: number;
	/** The loop's denominator dT (integrators and Padé denominator included) as a factored numerator. */
	loopDenominator: FactoredTf;
	/** The loop's numerator nT (Padé numerator included). */
	loopNumerator: FactoredTf;
	/** Padé order used for the delay (0 without one). */
	padeOrder: number;
	/** Backward error of the root finder (≈1e-16 perfect). */
	backwardError: number;
}

const rootMag = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0);

function factorPolyScaled(r: Root, k: number): number[] {
	if (r.kind === 'real') return [1, k / r.omega];
	const invQ = Number.isFinite(r.q) ? 1 / r.q : 0;
	const x = k / r.omega0;
	return [1, invQ * x, x * x];
}

/** Factored form of the Padé polynomial p (ascending, p(0) = 1). */
function padeFactors(p: number[]): Root[] {
	return rootsToFactors(polyRoots(p).roots).factors;
}

export interface ClosedLoopOptions {
	/** Padé order for a loop delay [the lowest n in 2…8 with < 0.5° error up to accurateToHz]. */
	padeOrder?: number;
	/** Frequency up to which the Padé phase must be accurate [1/delay]. */
	accurateToHz?: number;
}

/** The closed-loop characteristic polynomial of T and its factors. */
export function closedLoopDenominator(loop: FactoredTf, options: ClosedLoopOptions = {}): ClosedLoopDenominator {
	const delay = loop.delayS ?? 0;
	let padeOrder = 0;
	let padeNum: Root[] = [];
	let padeDen: Root[] = [];
	if (delay > 0) {
		padeOrder = options.padeOrder ?? choosePadeOrder(delay, options.accurateToHz ?? 1 / delay);
		const p = padeDelay(delay, padeOrder);
		padeNum = padeFactors(p.num);
		padeDen = padeFactors(p.den);
	}
	const zeros = [...loop.zeros, ...padeNum];
	const poles = [...loop.poles, ...padeDen];
	const scales = [...zeros, ...poles].map(rootMag).filter((w) => w > 0 && Number.isFinite(w));
	const k = scales.length ? Math.exp(scales.reduce((a, w) => a + Math.log(w), 0) / scales.length) : 1;

	// In x = s/k: T = gain·k^o·x^o·Π zeros(kx)/Π poles(kx).
	let num = polyScale(polyProduct(zeros.map((r) => factorPolyScaled(r, k))), loop.gain * Math.pow(k, loop.originPower));
	let den = polyProduct(poles.map((r) => factorPolyScaled(r, k)));
	if (loop.originPower > 0) num = polyShift(num, loop.originPower);
	if (loop.originPower < 0) den = polyShift(den, -loop.originPower);
	const ch = polyAdd(den, num);
	const n = degree(ch);
	if (n < Math.max(degree(den), degree(num))) {
		throw new RangeError('closed loop: 1 + T loses degree at s → ∞ (T(∞) = −1)');
	}
	if (!ch.every(Number.isFinite)) throw new RangeError('closed loop: non-finite characteristic polynomial');
	let low = 0;
	while (ch[low] === 0) low++;
	const r = polyRoots(ch);
	const polesS = r.roots.filter((z) => z.re !== 0 || z.im !== 0).map((z) => ({ re: z.re * k, im: z.im * k }));
	const factors = rootsToFactors(polesS).factors;

	const loopDenominator: FactoredTf = {
		gain: 1,
		originPower: Math.max(0, -loop.originPower),
		zeros: poles,
		poles: []
	};
	const loopNumerator: FactoredTf = {
		gain: loop.gain,
		originPower: Math.max(0, loop.originPower),
		zeros,
		poles: []
	};
	return {
		poles: factors,
		polesS,
		originPoles: low,
		// ch(x) = k^min(o,0)·char(kx), so char's s^low coefficient is ch[low]·k^max(0,−o)/k^low.
		lowestCoefficient: (ch[low] * Math.pow(k, Math.max(0, -loop.originPower))) / Math.pow(k, low),
		loopDenominator,
		loopNumerator,
		padeOrder,
		backwardError: r.backwardError
	};
}

/**
 * X/(1 + T) in factored form. `x` may carry poles that T also has (they cancel exactly);
 * the result's poles are X's remaining poles plus the closed-loop poles.
 * `numeratorOf`: 'denominator' gives X·dT/(dT + nT); 'numerator' gives X·nT/(dT + nT)
 * (X = 1 then gives the complementary sensitivity T/(1 + T)).
 */
export function closedLoopTf(
	x: FactoredTf,
	cl: ClosedLoopDenominator,
	numeratorOf: 'denominator' | 'numerator' = 'denominator'
): FactoredTf {
	if (x.delayS) throw new RangeError('closed loop: X must not carry a delay');
	const top = numeratorOf === 'denominator' ? cl.loopDenominator : cl.loopNumerator;
	// Cancel X's poles against the zeros of dT (the same factor objects, so an exact match).
	const prod = cancelCommon(multiply(x, top), 1e-12);
	return {
		gain: prod.gain / cl.lowestCoefficient,
		originPower: prod.originPower - cl.originPoles,
		zeros: prod.zeros,
		poles: [...prod.poles, ...cl.poles]
	};
}

/** True when every closed-loop pole lies strictly in the left half plane. */
export function isStable(cl: ClosedLoopDenominator): boolean {
	if (cl.originPoles > 0) return false;
	return cl.polesS.every((p) => p.re < -1e-12 * Math.hypot(p.re, p.im));
}
