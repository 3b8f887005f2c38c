/**
 * The bracketing grid for the loop metrics (docs/formulas.md §7.5, done with proofs instead of density):
 * start from the range ends and the loop's second-order corners, then bisect (in log ω) any
 * interval that the exact slope bounds of slopeBounds.ts cannot settle. An interval is settled
 * when, on it, ln|T| is monotone or provably keeps its sign, the unwrapped phase is monotone or
 * provably touches no −180° + k·360° line, and |1 + T| provably stays above the smallest sampled
 * value less a tolerance. So every gain and phase crossing in the range lies in its own interval
 * with a sign change (never two per interval), and the global minimum of |1 + T| is bracketed.
 */
import { lnMagPhaseSlopeAt, type CompiledTf } from '../tf/evaluate';
import { containsUndampedPair, hasUndampedPair, slopeBounds, slopeBoundsOf } from './slopeBounds';

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

// Interval ends are records of R = 7 numbers in a Float64Array, so the hot helpers below take
// arrays and offsets and no double arguments (V8 boxes those for calls it does not inline):
// [ln ω, ln|T|, phase, |T|, Re(1 + T), Im(1 + T), ω].
const R = 7;

/** Fill |T|, Re(1 + T), Im(1 + T) of the record at k from its ln|T| and phase; returns |1 + T|. */
function completeRecord(r: Float64Array, k: number): number {
	const m = Math.exp(r[k + 1]);
	const x = 1 + m * Math.cos(r[k + 2]);
	const y = m * Math.sin(r[k + 2]);
	r[k + 3] = m;
	r[k + 4] = x;
	r[k + 5] = y;
	return Math.sqrt(x * x + y * y);
}

/**
 * Lower and upper bounds of ln|T| (env[0], env[1]) and of the phase (env[2], env[3]) between
 * the records at a[ka] and b[kb], from their values and the slope bounds sb[0…3]: a function with
 * f' ∈ [sLo, sHi] satisfies max(fa + sLo·t, fb − sHi·(Δ − t)) ≤ f(t) ≤ min(fa + sHi·t, fb − sLo·(Δ − t)).
 */
function envelopes(a: Float64Array, ka: number, b: Float64Array, kb: number, sb: Float64Array, env: Float64Array): void {
	const delta = b[kb] - a[ka];
	for (let q = 0; q < 2; q++) {
		const fa = a[ka + 1 + q];
		const fb = b[kb + 1 + q];
		const sLo = sb[2 * q];
		const sHi = sb[2 * q + 1];
		const span = sHi - sLo;
		const fMin = fa < fb ? fa : fb;
		const fMax = fa < fb ? fb : fa;
		if (!(span > 0)) {
			env[2 * q] = fMin;
			env[2 * q + 1] = fMax;
			continue;
		}
		if (span === Infinity) {
			// Next to an undamped pair a slope bound is infinite; the general formula below would
			// give ∞/∞ = NaN and fall back to the end values, claiming a bound that does not hold.
			// With one side infinite, only the other line bounds f: f ≥ fa + sLo·t when sHi = ∞
			// (lowest at t = Δ), f ≤ fb − sLo·(Δ − t) (highest at t = 0); mirrored for sLo = −∞.
			const lo = sLo === -Infinity ? (sHi === Infinity ? -Infinity : fb - sHi * delta) : fa + sLo * delta;
			const hi = sHi === Infinity ? (sLo === -Infinity ? Infinity : fb - sLo * delta) : fa + sHi * delta;
			env[2 * q] = lo < fMin ? lo : fMin;
			env[2 * q + 1] = hi > fMax ? hi : fMax;
			continue;
		}
		let t = (fa - fb + sHi * delta) / span;
		t = t < 0 ? 0 : t > delta ? delta : t;
		const lo = fa + sLo * t;
		env[2 * q] = lo < fMin ? lo : fMin;
		let t2 = (fb - fa - sLo * delta) / span;
		t2 = t2 < 0 ? 0 : t2 > delta ? delta : t2;
		const hi = fa + sHi * t2;
		env[2 * q + 1] = hi > fMax ? hi : fMax;
	}
}

/** Smallest |1 + T| over T = m·e^(jφ), m ∈ [e^env[0], e^env[1]], φ ∈ [env[2], env[3]]. */
function distanceLowerBound(env: Float64Array): number {
	const phLo = env[2];
	const phHi = env[3];
	// Angular gap between the phase interval and the nearest odd multiple of π.
	const below = Math.PI + TWO_PI * Math.floor((phLo - Math.PI) / TWO_PI); // ≤ phLo
	const above = below + TWO_PI;
	let gap = 0;
	if (!(phHi - phLo >= TWO_PI || below === phLo || above <= phHi)) gap = Math.min(phLo - below, above - phHi);
	const cg = Math.cos(gap);
	const m1 = Math.exp(env[0]);
	const m2 = Math.exp(env[1]);
	const r = cg <= 0 ? m1 : cg < m1 ? m1 : cg > m2 ? m2 : cg;
	return Math.sqrt(Math.max(0, 1 + r * r - 2 * r * cg));
}

/** Largest deviation from its chord of a function with slope in [sLo, sHi] and mean slope `mean` on an interval of width Δ. */
function chordDeviation(sLo: number, sHi: number, mean: number, delta: number): number {
	const span = sHi - sLo;
	if (!(span > 0)) return 0;
	return (Math.max(0, sHi - mean) * Math.max(0, mean - sLo) * delta) / span;
}

/**
 * Second-order lower bound of |1 + T| between the records at a[ka] and b[kb] [derived here]: in
 * log space ln T is its chord plus E with |Re E| ≤ εm, |Im E| ≤ εp (chordDeviation of the slope
 * bounds sb), so T = S·e^E with S the spiral through both end values; S departs from the straight
 * segment between T(a) and T(b) by at most √2·|S''|·Δ²/8 (per component), |S''| = (α² + β²)·|S|.
 * Hence |1 + T| ≥ dist(−1, segment) − m_max·(√2(α² + β²)Δ²/8 + (e^|E| − 1)).
 */
function distanceLowerBoundChord(a: Float64Array, ka: number, b: Float64Array, kb: number, sb: Float64Array): number {
	const delta = b[kb] - a[ka];
	const alpha = (b[kb + 1] - a[ka + 1]) / delta;
	const beta = (b[kb + 2] - a[ka + 2]) / delta;
	const em = chordDeviation(sb[0], sb[1], alpha, delta);
	const ep = chordDeviation(sb[2], sb[3], beta, delta);
	const ax = a[ka + 4];
	const ay = a[ka + 5];
	const dx = b[kb + 4] - ax;
	const dy = b[kb + 5] - ay;
	// Distance from the origin to the segment from 1 + T(a) to 1 + T(b) (that is, from −1 to T(a)–T(b)).
	const len2 = dx * dx + dy * dy;
	let t = len2 > 0 ? -(ax * dx + ay * dy) / len2 : 0;
	t = t < 0 ? 0 : t > 1 ? 1 : t;
	const ex = ax + t * dx;
	const ey = ay + t * dy;
	const segment = Math.sqrt(ex * ex + ey * ey);
	const mMax = a[ka + 3] > b[kb + 3] ? a[ka + 3] : b[kb + 3];
	return segment - mMax * (Math.SQRT2 * (alpha * alpha + beta * beta) * delta * delta * 0.125 + Math.expm1(Math.sqrt(em * em + ep * ep)));
}

/**
 * The lower bound of |1 + T(jω)| over [omegaA, omegaB] that the grid uses (the better of the
 * first-order box bound and the second-order chord bound), from the end values and the slope
 * bounds. Exposed for tests; the grid computes it from values it already has.
 */
export function modulusLowerBound(c: CompiledTf, omegaA: number, omegaB: number): number {
	const buf = new Float64Array(4);
	const ends = new Float64Array(2 * R);
	for (const [k, w] of [[0, omegaA], [R, omegaB]]) {
		lnMagPhaseSlopeAt(c, w, buf);
		ends[k] = Math.log(w);
		ends[k + 1] = buf[0];
		ends[k + 2] = buf[1];
		ends[k + 6] = w;
		completeRecord(ends, k);
	}
	const sb = new Float64Array(6);
	slopeBounds(c, omegaA, omegaB, sb);
	const env = new Float64Array(4);
	envelopes(ends, 0, ends, R, sb, env);
	return Math.max(distanceLowerBound(env), distanceLowerBoundChord(ends, 0, ends, R, sb));
}

/** No −π + 2πk line in [lo, hi]. */
function noPhaseLine(lo: number, hi: number): boolean {
	return Math.ceil((lo + Math.PI) / TWO_PI) > Math.floor((hi + Math.PI) / TWO_PI);
}

// Scratch reused across calls (sampleLoop is synchronous and never re-entered): typed arrays
// beyond a few elements live outside the JS heap, and allocating them per call costs more than
// the evaluations they serve.
let pointScratch = new Float64Array(64);
/** Numbers per pending point on the bisection stack: its record (R), slopes, |1 + T|, depth. */
const W = R + 4;
let stackScratch = new Float64Array(W * 128);
const evalScratch = new Float64Array(4);
/** The record of the last accepted sample. */
const last = new Float64Array(R);
const boundScratch = new Float64Array(8);
const envelopeScratch = new Float64Array(4);

/** Starting points, ascending: the range ends and, for each pair, ω0, its half-power points when
 * resonant (|Q| > 2) or its two real roots when overdamped, or points either side of ω0 when
 * undamped. Real corners are left to the bisection: their slopes are gentle, and seeding them
 * costs more evaluations (22 against 18 on the bench loops) than it saves. */
function startingPoints(c: CompiledTf, omegaStart: number, omegaStop: number, undamped: boolean): Float64Array {
	const size = 2 + 3 * (c.zPairInvW.length + c.pPairInvW.length);
	if (pointScratch.length < size) pointScratch = new Float64Array(2 * size);
	const pts = pointScratch;
	let k = 0;
	pts[k++] = omegaStart;
	pts[k++] = omegaStop;
	for (let side = 0; side < 2; side++) {
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
	// No sample exactly on an undamped pair's ω0 (another pair may share it): |T| is 0 or ∞
	// there and the slopes are not defined; its neighbours at ω0(1 ± 1e-9) stand in for it.
	if (undamped) {
		let kept = 0;
		for (let i = 0; i < k; i++) if (!containsUndampedPair(c, pts[i], pts[i], true)) pts[kept++] = pts[i];
		k = kept;
	}
	// Insertion sort: a few dozen values, and no temporary array (TypedArray#sort allocates one).
	for (let i = 1; i < k; i++) {
		const v = pts[i];
		let j = i - 1;
		while (j >= 0 && pts[j] > v) {
			pts[j + 1] = pts[j];
			j--;
		}
		pts[j + 1] = v;
	}
	return pts.subarray(0, k);
}

/**
 * The bracketing grid in reusable scratch storage: the arrays (first `n` entries valid) are
 * overwritten by the next call, so callers copy what they keep. loopMetrics uses it directly;
 * sampleLoop returns a copy.
 */
export interface GridScratch {
	n: number;
	omega: Float64Array;
	logOmega: Float64Array;
	lnMag: Float64Array;
	phase: Float64Array;
	lnMagSlope: Float64Array;
	phaseSlope: Float64Array;
	distance: Float64Array;
	iMinDistance: number;
	evaluations: number;
}

const grid: GridScratch = {
	n: 0,
	omega: new Float64Array(256),
	logOmega: new Float64Array(256),
	lnMag: new Float64Array(256),
	phase: new Float64Array(256),
	lnMagSlope: new Float64Array(256),
	phaseSlope: new Float64Array(256),
	distance: new Float64Array(256),
	iMinDistance: 0,
	evaluations: 0
};

function growGrid(): void {
	const size = 2 * grid.omega.length;
	const g = (a: Float64Array) => {
		const b = new Float64Array(size);
		b.set(a);
		return b;
	};
	grid.omega = g(grid.omega);
	grid.logOmega = g(grid.logOmega);
	grid.lnMag = g(grid.lnMag);
	grid.phase = g(grid.phase);
	grid.lnMagSlope = g(grid.lnMagSlope);
	grid.phaseSlope = g(grid.phaseSlope);
	grid.distance = g(grid.distance);
}

/** The bracketing grid of the loop over [omegaStart, omegaStop] (see the module header), as a fresh copy. */
export function sampleLoop(c: CompiledTf, omegaStart: number, omegaStop: number, options: GridOptions = {}): SampledLoop {
	const g = bracketingGrid(c, omegaStart, omegaStop, options);
	const copy = (a: Float64Array) => Array.from(a.subarray(0, g.n));
	return {
		n: g.n,
		omega: copy(g.omega),
		logOmega: copy(g.logOmega),
		lnMag: copy(g.lnMag),
		phase: copy(g.phase),
		lnMagSlope: copy(g.lnMagSlope),
		phaseSlope: copy(g.phaseSlope),
		distance: copy(g.distance),
		iMinDistance: g.iMinDistance,
		evaluations: g.evaluations
	};
}

// The modulus test's threshold t = best·(1 − tol) and ln(1 ± t): |1 + T| ≥ | |T| − 1 |, so an
// interval whose ln|T| stays outside (ln(1 − t), ln(1 + t)) passes without the full bound.
const modulus = new Float64Array(3);

function setModulusThreshold(t: number): void {
	modulus[0] = t;
	modulus[1] = Math.log1p(t);
	modulus[2] = t < 1 ? Math.log1p(-t) : -Infinity;
}

/**
 * Is the interval from the last accepted sample to the stacked point at `top` settled (module
 * header)? Everything comes from arrays, so the call passes no doubles.
 */
function intervalSettled(c: CompiledTf, stack: Float64Array, top: number, undamped: boolean): boolean {
	const delta = stack[top] - last[0];
	if (!(delta > 1e-13 * Math.max(1, Math.abs(stack[top])))) return true;
	if (undamped && containsUndampedPair(c, last[6], stack[top + 6])) return true;
	const sb = boundScratch;
	const env = envelopeScratch;
	sb[6] = last[6];
	sb[7] = stack[top + 6];
	slopeBoundsOf(c, sb);
	envelopes(last, 0, stack, top, sb, env);
	return (
		// ln|T| monotone (one crossing at most) or of one sign throughout,
		(sb[0] >= 0 || sb[1] <= 0 || env[0] > 0 || env[1] < 0) &&
		// the phase monotone or clear of every −180° + k·360° line,
		(sb[2] >= 0 || sb[3] <= 0 || noPhaseLine(env[2], env[3])) &&
		// and |1 + T| above the smallest sample less the tolerance.
		(env[0] >= modulus[1] ||
			env[1] <= modulus[2] ||
			distanceLowerBoundChord(last, 0, stack, top, sb) >= modulus[0] ||
			distanceLowerBound(env) >= modulus[0])
	);
}

/** Evaluate the loop at the stack entry at k (ln ω in [k], ω in [k + 6]): the rest of its record, slopes, |1 + T|, depth. */
function evaluateInto(c: CompiledTf, stack: Float64Array, k: number, depth: number): number {
	const buf = evalScratch;
	lnMagPhaseSlopeAt(c, stack[k + 6], buf, stack[k]);
	stack[k + 1] = buf[0];
	stack[k + 2] = buf[1];
	stack[k + R] = buf[2];
	stack[k + R + 1] = buf[3];
	const d = completeRecord(stack, k);
	stack[k + R + 2] = d;
	stack[k + R + 3] = depth;
	return d;
}

/** The bracketing grid in scratch storage (valid until the next call). */
export function bracketingGrid(c: CompiledTf, omegaStart: number, omegaStop: number, options: GridOptions = {}): GridScratch {
	const maxDepth = options.maxDepth ?? 60;
	const relTol = options.modulusRelTol ?? 0.01;
	const undamped = hasUndampedPair(c);
	const start = startingPoints(c, omegaStart, omegaStop, undamped);

	if (stackScratch.length < W * (start.length + 8)) stackScratch = new Float64Array(2 * W * (start.length + 8));
	let stack = stackScratch;
	let sp = 0;
	let best = Infinity;
	for (let i = start.length - 1; i >= 0; i--) {
		const w = start[i];
		if (i < start.length - 1 && !(w < start[i + 1])) continue; // duplicate
		stack[sp] = Math.log(w);
		stack[sp + 6] = w;
		const d = evaluateInto(c, stack, sp, 0);
		if (d < best) best = d;
		sp += W;
	}
	let evaluations = sp / W;
	setModulusThreshold(best * (1 - relTol));
	let { omega, logOmega, lnMag, phase, lnMagSlope, phaseSlope, distance } = grid;
	let n = 0;
	while (sp > 0) {
		const top = sp - W;
		// Is the interval from the last accepted sample to the top of the stack settled?
		const settled = n === 0 || stack[top + R + 3] >= maxDepth || intervalSettled(c, stack, top, undamped);
		if (settled) {
			if (n === omega.length) {
				growGrid();
				({ omega, logOmega, lnMag, phase, lnMagSlope, phaseSlope, distance } = grid);
			}
			omega[n] = stack[top + 6];
			logOmega[n] = stack[top];
			lnMag[n] = stack[top + 1];
			phase[n] = stack[top + 2];
			lnMagSlope[n] = stack[top + R];
			phaseSlope[n] = stack[top + R + 1];
			distance[n] = stack[top + R + 2];
			for (let j = 0; j < R; j++) last[j] = stack[top + j];
			n++;
			sp = top;
			continue;
		}
		const depth = stack[top + R + 3] + 1;
		stack[top + R + 3] = depth;
		if (sp + W > stack.length) {
			const grown = new Float64Array(2 * stack.length);
			grown.set(stack);
			stack = stackScratch = grown;
		}
		const u = 0.5 * (last[0] + stack[top]);
		stack[sp] = u;
		stack[sp + 6] = Math.exp(u);
		const d = evaluateInto(c, stack, sp, depth);
		evaluations++;
		if (d < best) {
			best = d;
			setModulusThreshold(best * (1 - relTol));
		}
		sp += W;
	}

	let iMin = 0;
	for (let i = 1; i < n; i++) if (distance[i] < distance[iMin]) iMin = i;
	grid.n = n;
	grid.iMinDistance = iMin;
	grid.evaluations = evaluations;
	return grid;
}
