/**
 * The bracketing grid for the loop metrics (formulas §7.5, done with proofs instead of density):
 * start from the range ends and every corner frequency of the loop, then bisect (in log ω) any
 * interval that the exact slope bounds of slopeBounds.ts cannot settle. An interval is settled
 * when, on it, ln|T| is monotone or provably keeps its sign, the unwrapped phase is monotone or
 * provably touches no −180° + k·360° line, and |1 + T| provably stays above the smallest sampled
 * value less a tolerance. So every gain and phase crossing in the range lies in its own interval
 * with a sign change (never two per interval), and the global minimum of |1 + T| is bracketed.
 */
import { lnMagPhaseSlopeAt, type CompiledTf } from '../tf/evaluate';
import { containsUndampedPair, slopeBounds } from './slopeBounds';

export interface GridOptions {
	/** Maximum bisection depth below each starting interval [60]. */
	maxDepth?: number;
	/** The sampled minimum of |1 + T| is within this fraction of the true global minimum [0.01];
	 * the metrics then refine it locally to full precision. */
	modulusRelTol?: number;
}

export interface SampledLoop {
	/** Number of samples. */
	n: number;
	/** Ascending angular frequencies, rad/s. */
	omega: number[];
	/** ln ω of each sample. */
	logOmega: number[];
	lnMag: number[];
	phase: number[];
	/** d ln|T|/d ln ω and d phase/d ln ω at each sample. */
	lnMagSlope: number[];
	phaseSlope: number[];
	/** |1 + T| at each sample. */
	distance: number[];
	/** Index of the smallest |1 + T| sample. */
	iMinDistance: number;
	/** Loop evaluations spent. */
	evaluations: number;
}

const TWO_PI = 2 * Math.PI;

/** |1 + m·e^(jφ)| with m = e^lnMag. */
export function distanceToMinusOne(lnMag: number, phase: number): number {
	const m = Math.exp(lnMag);
	return Math.sqrt(Math.max(0, 1 + 2 * m * Math.cos(phase) + m * m));
}

/** Lower and upper bounds of f on [0, Δ] from its end values and slope bounds [sLo, sHi]. */
function envelope(fa: number, fb: number, sLo: number, sHi: number, delta: number, out: Float64Array, k: number): void {
	const span = sHi - sLo;
	const fMin = fa < fb ? fa : fb;
	const fMax = fa < fb ? fb : fa;
	if (!(span > 0)) {
		out[k] = fMin;
		out[k + 1] = fMax;
		return;
	}
	// f(t) ≥ max(fa + sLo·t, fb − sHi·(Δ − t)); f(t) ≤ min(fa + sHi·t, fb − sLo·(Δ − t)).
	let t = (fa - fb + sHi * delta) / span;
	t = t < 0 ? 0 : t > delta ? delta : t;
	const lo = fa + sLo * t;
	out[k] = lo < fMin ? lo : fMin;
	let t2 = (fb - fa - sLo * delta) / span;
	t2 = t2 < 0 ? 0 : t2 > delta ? delta : t2;
	const hi = fa + sHi * t2;
	out[k + 1] = hi > fMax ? hi : fMax;
}

/** Smallest |1 + T| over T = m·e^(jφ), m ∈ [e^lnLo, e^lnHi], φ ∈ [phLo, phHi]. */
function distanceLowerBound(lnLo: number, lnHi: number, phLo: number, phHi: number): number {
	// Angular gap between the phase interval and the nearest odd multiple of π.
	const below = Math.PI + TWO_PI * Math.floor((phLo - Math.PI) / TWO_PI); // ≤ phLo
	const above = below + TWO_PI;
	let gap = 0;
	if (!(phHi - phLo >= TWO_PI || below === phLo || above <= phHi)) gap = Math.min(phLo - below, above - phHi);
	const cg = Math.cos(gap);
	const m1 = Math.exp(lnLo);
	const m2 = Math.exp(lnHi);
	const r = cg <= 0 ? m1 : cg < m1 ? m1 : cg > m2 ? m2 : cg;
	return Math.sqrt(Math.max(0, 1 + r * r - 2 * r * cg));
}

/** No −π + 2πk line in [lo, hi]. */
function noPhaseLine(lo: number, hi: number): boolean {
	return Math.ceil((lo + Math.PI) / TWO_PI) > Math.floor((hi + Math.PI) / TWO_PI);
}

// Scratch reused across calls (sampleLoop is synchronous and never re-entered): typed arrays
// beyond a few elements live outside the JS heap, and allocating them per call costs more than
// the evaluations they serve.
let pointScratch = new Float64Array(64);
let stackScratch = new Float64Array(8 * 128);
const evalScratch = new Float64Array(4);
const boundScratch = new Float64Array(6);
const envelopeScratch = new Float64Array(4);

/** Starting points, ascending: the range ends, every corner, the half-power points of resonant
 * pairs (|Q| > 2), the two real roots of overdamped pairs, and points either side of an undamped
 * pair. */
function startingPoints(c: CompiledTf, omegaStart: number, omegaStop: number): Float64Array {
	const size = 2 + c.zReal.length + c.pReal.length + 3 * (c.zPairInvW.length + c.pPairInvW.length);
	if (pointScratch.length < size) pointScratch = new Float64Array(2 * size);
	const pts = pointScratch;
	let k = 0;
	pts[k++] = omegaStart;
	pts[k++] = omegaStop;
	for (let side = 0; side < 2; side++) {
		const real = side === 0 ? c.zReal : c.pReal;
		for (let i = 0; i < real.length; i++) {
			const w = 1 / Math.abs(real[i]);
			if (w > omegaStart && w < omegaStop) pts[k++] = w;
		}
		const invW = side === 0 ? c.zPairInvW : c.pPairInvW;
		const invQ = side === 0 ? c.zPairInvQ : c.pPairInvQ;
		for (let i = 0; i < invW.length; i++) {
			const w0 = 1 / invW[i];
			const iq = Math.abs(invQ[i]);
			let w1 = w0;
			let w2 = w0;
			if (iq === 0) {
				w1 = w0 * (1 - 1e-9);
				w2 = w0 * (1 + 1e-9);
			} else if (iq < 0.5) {
				w1 = w0 * (1 - iq / 2);
				w2 = w0 * (1 + iq / 2);
			} else if (iq >= 2) {
				w1 = (w0 * (iq + Math.sqrt(iq * iq - 4))) / 2;
				w2 = (w0 * w0) / w1;
			}
			if (iq !== 0 && w0 > omegaStart && w0 < omegaStop) pts[k++] = w0;
			if (w1 !== w0 && w1 > omegaStart && w1 < omegaStop) pts[k++] = w1;
			if (w2 !== w0 && w2 > omegaStart && w2 < omegaStop) pts[k++] = w2;
		}
	}
	return pts.subarray(0, k).sort();
}

export function sampleLoop(c: CompiledTf, omegaStart: number, omegaStop: number, options: GridOptions = {}): SampledLoop {
	const maxDepth = options.maxDepth ?? 60;
	const relTol = options.modulusRelTol ?? 0.01;
	const start = startingPoints(c, omegaStart, omegaStop);

	const out: SampledLoop = {
		n: 0,
		omega: [],
		logOmega: [],
		lnMag: [],
		phase: [],
		lnMagSlope: [],
		phaseSlope: [],
		distance: [],
		iMinDistance: 0,
		evaluations: 0
	};
	const { omega, logOmega, lnMag, phase, lnMagSlope, phaseSlope, distance } = out;

	// Evaluate the starting points first: their smallest |1 + T| is the first bound to beat.
	// Pending points (a stack, highest frequency at the bottom) hold 8 numbers each:
	// ω, ln ω, ln|T|, phase, magnitude slope, phase slope, |1 + T|, bisection depth.
	const buf = evalScratch;
	if (stackScratch.length < 8 * (start.length + 8)) stackScratch = new Float64Array(16 * (start.length + 8));
	let stack = stackScratch;
	let sp = 0;
	let best = Infinity;
	for (let i = start.length - 1; i >= 0; i--) {
		const w = start[i];
		if (i < start.length - 1 && !(w < start[i + 1])) continue; // duplicate
		lnMagPhaseSlopeAt(c, w, buf);
		const d = distanceToMinusOne(buf[0], buf[1]);
		if (d < best) best = d;
		stack[sp] = w;
		stack[sp + 1] = Math.log(w);
		stack[sp + 2] = buf[0];
		stack[sp + 3] = buf[1];
		stack[sp + 4] = buf[2];
		stack[sp + 5] = buf[3];
		stack[sp + 6] = d;
		stack[sp + 7] = 0;
		sp += 8;
	}
	let evaluations = sp / 8;
	// |1 + T| ≥ | |T| − 1 |: an interval whose ln|T| stays outside (ln(1 − t), ln(1 + t)) is
	// clear of the modulus test without the full bound; t moves only when `best` does.
	let threshold = best * (1 - relTol);
	let lnUpper = Math.log1p(threshold);
	let lnLower = threshold < 1 ? Math.log1p(-threshold) : -Infinity;

	const sb = boundScratch;
	const env = envelopeScratch;
	let n = 0;
	while (sp > 0) {
		const top = sp - 8;
		// Is the interval from the last accepted sample to the top of the stack settled?
		let settled = n === 0 || stack[top + 7] >= maxDepth;
		if (!settled) {
			const i = n - 1;
			const wa = omega[i];
			const wb = stack[top];
			const delta = stack[top + 1] - logOmega[i];
			if (!(delta > 1e-13 * Math.max(1, Math.abs(stack[top + 1]))) || containsUndampedPair(c, wa, wb)) settled = true;
			else {
				slopeBounds(c, wa, wb, sb);
				envelope(lnMag[i], stack[top + 2], sb[0], sb[1], delta, env, 0);
				envelope(phase[i], stack[top + 3], sb[2], sb[3], delta, env, 2);
				settled =
					// ln|T| monotone (one crossing at most) or of one sign throughout,
					(sb[0] >= 0 || sb[1] <= 0 || env[0] > 0 || env[1] < 0) &&
					// the phase monotone or clear of every −180° + k·360° line,
					(sb[2] >= 0 || sb[3] <= 0 || noPhaseLine(env[2], env[3])) &&
					// and |1 + T| above the smallest sample less the tolerance.
					(env[0] >= lnUpper || env[1] <= lnLower || distanceLowerBound(env[0], env[1], env[2], env[3]) >= threshold);
			}
		}
		if (settled) {
			omega.push(stack[top]);
			logOmega.push(stack[top + 1]);
			lnMag.push(stack[top + 2]);
			phase.push(stack[top + 3]);
			lnMagSlope.push(stack[top + 4]);
			phaseSlope.push(stack[top + 5]);
			distance.push(stack[top + 6]);
			n++;
			sp = top;
			continue;
		}
		const depth = stack[top + 7] + 1;
		stack[top + 7] = depth;
		const u = 0.5 * (logOmega[n - 1] + stack[top + 1]);
		const w = Math.exp(u);
		lnMagPhaseSlopeAt(c, w, buf);
		evaluations++;
		const d = distanceToMinusOne(buf[0], buf[1]);
		if (d < best) {
			best = d;
			threshold = best * (1 - relTol);
			lnUpper = Math.log1p(threshold);
			lnLower = threshold < 1 ? Math.log1p(-threshold) : -Infinity;
		}
		if (sp + 8 > stack.length) {
			const grown = new Float64Array(2 * stack.length);
			grown.set(stack);
			stack = stackScratch = grown;
		}
		stack[sp] = w;
		stack[sp + 1] = u;
		stack[sp + 2] = buf[0];
		stack[sp + 3] = buf[1];
		stack[sp + 4] = buf[2];
		stack[sp + 5] = buf[3];
		stack[sp + 6] = d;
		stack[sp + 7] = depth;
		sp += 8;
	}

	let iMin = 0;
	for (let i = 1; i < n; i++) if (distance[i] < distance[iMin]) iMin = i;
	out.n = n;
	out.iMinDistance = iMin;
	out.evaluations = evaluations;
	return out;
}
