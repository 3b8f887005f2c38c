/**
 * Exact bounds on the slopes d ln|T|/d ln ω and d∠T/d ln ω of a compiled loop over a frequency
 * interval, factor by factor, so the bracketing grid can prove that an interval holds no
 * crossing (or at most one). Each factor's slope is a known function of x = ω/ωc whose extrema
 * are closed-form [derived here, see slopeBounds]; the loop's bound is the sum of the factors'.
 */
import type { CompiledTf } from '../tf/evaluate';

/**
 * Magnitude slope of a pair at y = x² (iq2 = 1/q²): y(2y + a)/(y² + ay + 1), a = 1/q² − 2, written as
 * y(2(y − 1) + 1/q²)/((y − 1)² + y/q²): the same function, but without the cancellation of
 * y² − 2y + 1 near ω0 of a high-Q pair (it lost 8 digits at 1.5e-4 from an undamped ω0).
 */
function pairMagSlope(y: number, iq2: number): number {
	const u = y - 1;
	return (y * (2 * u + iq2)) / (u * u + iq2 * y);
}

// The per-pair helpers read the pair from its arrays and the interval from io[6] = ωA,
// io[7] = ωB, and write their bounds to io[4…5]: no double arguments, which V8 boxes for calls
// it does not inline.

/** Bounds of the magnitude slope of pair i (1/ω0 = invW[i], 1/q = invQ[i]) over the interval. */
function pairMagRange(invW: Float64Array, invQ: Float64Array, i: number, io: Float64Array): void {
	const iq2 = invQ[i] * invQ[i];
	const a = iq2 - 2;
	const xa = io[6] * invW[i];
	const xb = io[7] * invW[i];
	const ya = xa * xa;
	const yb = xb * xb;
	let lo = pairMagSlope(ya, iq2);
	let hi = pairMagSlope(yb, iq2);
	if (lo > hi) {
		const t = lo;
		lo = hi;
		hi = t;
	}
	// Interior extrema where a·y² + 4y + a = 0: two positive roots (product 1) when −2 < a < 0.
	if (a < 0 && a > -2) {
		const root = Math.sqrt(4 - a * a);
		const y1 = (-2 + root) / a;
		const y2 = 1 / y1;
		if (y1 > ya && y1 < yb) {
			const v = pairMagSlope(y1, iq2);
			if (v < lo) lo = v;
			if (v > hi) hi = v;
		}
		if (y2 > ya && y2 < yb) {
			const v = pairMagSlope(y2, iq2);
			if (v < lo) lo = v;
			if (v > hi) hi = v;
		}
	}
	io[4] = lo;
	io[5] = hi;
}

/**
 * Bounds of the phase slope of pair i over the interval, without the sign of 1/q.
 * Complex roots (|q| > 1/2): |1/q|·x(1 + x²)/((1 − x²)² + x²/q²), whose log-derivative in y = x²
 * has the sign of (1 − y)(y² + (6 − 1/q²)y + 1), positive below y = 1 and negative above for
 * |q| > 1/√8: it rises to 2|q| at x = 1, then falls. Real roots (|q| ≤ 1/2): the two real
 * factors ω1·ω2 = ω0², ω1 + ω2 = ω0/|q|, each bounded as a real factor (x/(1 + x²), peak 1/2 at 1).
 */
function pairPhaseRange(invW: Float64Array, invQ: Float64Array, i: number, io: Float64Array): void {
	const absInvQ = invQ[i] < 0 ? -invQ[i] : invQ[i];
	const xa = io[6] * invW[i];
	const xb = io[7] * invW[i];
	if (absInvQ < 2) {
		const ra = 1 - xa * xa;
		const rb = 1 - xb * xb;
		const q2 = absInvQ * absInvQ;
		const ka = (absInvQ * xa * (1 + xa * xa)) / (ra * ra + xa * xa * q2);
		const kb = (absInvQ * xb * (1 + xb * xb)) / (rb * rb + xb * xb * q2);
		io[4] = ka < kb ? ka : kb;
		io[5] = xa <= 1 && xb >= 1 ? 2 / absInvQ : ka > kb ? ka : kb;
		return;
	}
	// x1 = ω/ω1, x2 = ω/ω2 with ω1 = ω0·(|1/q| + √(1/q² − 4))/2 and ω2 = ω0²/ω1.
	const r1 = 2 / (absInvQ + Math.sqrt(absInvQ * absInvQ - 4));
	let lo = 0;
	let hi = 0;
	for (let j = 0; j < 2; j++) {
		const r = j === 0 ? r1 : 1 / r1;
		const x1 = xa * r;
		const x2 = xb * r;
		const g1 = x1 / (1 + x1 * x1);
		const g2 = x2 / (1 + x2 * x2);
		lo += g1 < g2 ? g1 : g2;
		hi += x1 <= 1 && x2 >= 1 ? 0.5 : g1 > g2 ? g1 : g2;
	}
	io[4] = lo;
	io[5] = hi;
}

/**
 * Bounds of both slopes over [omegaA, omegaB] (0 < omegaA < omegaB), written to
 * out[0…3] = [magLo, magHi, phaseLo, phaseHi] (per unit of ln ω). Valid when no undamped pair
 * (1/q = 0) has its ω0 strictly inside.
 * Real factor, magnitude x²/(1 + x²): increasing in x, bounded by its ends; phase x/(1 + x²):
 * rises to 1/2 at x = 1, then falls. Pair, magnitude: extrema at the ends or where
 * a·y² + 4y + a = 0 (the derivative of y(2y + a)/(y² + ay + 1)). Delay: −ωTd, monotone.
 */
export function slopeBounds(c: CompiledTf, omegaA: number, omegaB: number, out: Float64Array): void {
	io[6] = omegaA;
	io[7] = omegaB;
	slopeBoundsOf(c, io);
	for (let i = 0; i < 4; i++) out[i] = io[i];
}

const io = new Float64Array(8);

/**
 * slopeBounds with the interval read from io[6] = ωA, io[7] = ωB and the bounds written to
 * io[0…3] (io[4…5] scratch): the grid's hot path, which passes no doubles as arguments (V8 boxes
 * them for calls it does not inline).
 */
export function slopeBoundsOf(c: CompiledTf, io: Float64Array): void {
	const omegaA = io[6];
	const omegaB = io[7];
	const out = io;
	let mLo = c.originPower;
	let mHi = c.originPower;
	let pLo = -omegaB * c.delayS;
	let pHi = -omegaA * c.delayS;

	for (let side = 0; side < 2; side++) {
		const real = side === 0 ? c.zReal : c.pReal;
		for (let i = 0; i < real.length; i++) {
			const r = real[i];
			const ar = r < 0 ? -r : r;
			const xa = omegaA * ar;
			const xb = omegaB * ar;
			const da = 1 / (1 + xa * xa);
			const db = 1 / (1 + xb * xb);
			// magnitude x²/(1 + x²), rising; phase x/(1 + x²), peaking at 1/2 for x = 1
			const lo = xa * xa * da;
			const hi = xb * xb * db;
			const ga = xa * da;
			const gb = xb * db;
			const gLo = ga < gb ? ga : gb;
			const gHi = xa <= 1 && xb >= 1 ? 0.5 : ga > gb ? ga : gb;
			if (side === 0) {
				mLo += lo;
				mHi += hi;
			} else {
				mLo -= hi;
				mHi -= lo;
			}
			// A zero adds its slopes, a pole subtracts them; a RHP root flips the phase slope.
			if ((side === 0) === r > 0) {
				pLo += gLo;
				pHi += gHi;
			} else {
				pLo -= gHi;
				pHi -= gLo;
			}
		}
		const invW = side === 0 ? c.zPairInvW : c.pPairInvW;
		const invQ = side === 0 ? c.zPairInvQ : c.pPairInvQ;
		for (let i = 0; i < invW.length; i++) {
			const iq = invQ[i];
			pairMagRange(invW, invQ, i, out);
			if (side === 0) {
				mLo += out[4];
				mHi += out[5];
			} else {
				mLo -= out[5];
				mHi -= out[4];
			}
			if (iq === 0) continue; // undamped: flat phase away from ω0
			pairPhaseRange(invW, invQ, i, out);
			const phaseSign = (side === 0) === iq > 0 ? 1 : -1;
			if (phaseSign > 0) {
				pLo += out[4];
				pHi += out[5];
			} else {
				pLo -= out[5];
				pHi -= out[4];
			}
		}
	}
	out[0] = mLo;
	out[1] = mHi;
	out[2] = pLo;
	out[3] = pHi;
}

/** True when the loop has an undamped pair (1/q = 0) anywhere. */
export function hasUndampedPair(c: CompiledTf): boolean {
	for (let i = 0; i < c.zPairInvQ.length; i++) if (c.zPairInvQ[i] === 0) return true;
	for (let i = 0; i < c.pPairInvQ.length; i++) if (c.pPairInvQ[i] === 0) return true;
	return false;
}

/** True when an undamped pair (1/q = 0) has its ω0 strictly inside (omegaA, omegaB), or on
 * [omegaA, omegaB] with `closed`. */
export function containsUndampedPair(c: CompiledTf, omegaA: number, omegaB: number, closed = false): boolean {
	for (let side = 0; side < 2; side++) {
		const invW = side === 0 ? c.zPairInvW : c.pPairInvW;
		const invQ = side === 0 ? c.zPairInvQ : c.pPairInvQ;
		for (let i = 0; i < invW.length; i++) {
			if (invQ[i] !== 0) continue;
			const w0 = 1 / invW[i];
			if (closed ? w0 >= omegaA && w0 <= omegaB : w0 > omegaA && w0 < omegaB) return true;
		}
	}
	return false;
}
