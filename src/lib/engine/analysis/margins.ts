/**
 * Loop metrics (docs/formulas.md §7): every gain crossover (|T| = 1) and phase crossover
 * (∠T = −180° + k·360°) in the analysed range, each bracketed by the proven grid of
 * analysisGrid.ts and refined by bracketed Newton on the analytic ln|T| or unwrapped phase in
 * log f (exact slopes); PM per crossing and GM per phase crossing, the governing (headline) PM and
 * GM, gain-reduction margin, delay margin, modulus margin min|1 + T| (Brent's minimiser). A margin
 * that does not exist is null, with its reason in `unavailable`.
 *
 * Governing margins: the headline PM is the gain crossing with the smallest |PM| and the headline
 * GM the phase crossing with the smallest |GM dB|, i.e. the crossings whose point lies nearest the
 * critical point −1 in angle or in gain (the convention of python-control's `stability_margins`
 * [from memory]). A crossing where the loop phase is near 0° (PM ≈ ±180°) is far from −1 and never
 * governs; every crossing stays listed with its own margin. Corners, spread, board health and the
 * verdict all read these headline figures, so there is one rule.
 */
import { brentMin, brentRoot, newtonBracketed } from '../math/scalarRoot';
import { compileTf, lnMagPhaseAt, lnMagPhaseSlopeAt, type CompiledTf } from '../tf/evaluate';
import type { FactoredTf } from '../tf/types';
import { bracketingGrid, distanceToMinusOne, type GridOptions } from './analysisGrid';
import { containsUndampedPair, hasUndampedPair } from './slopeBounds';
import { closedLoopStability, type ClosedLoopResult } from './closedLoop';

const RAD2DEG = 180 / Math.PI;
const TWO_PI = 2 * Math.PI;

export interface GainCrossover {
	freqHz: number;
	/** 180° + ∠T reduced to (−180°, 180°]. */
	phaseMarginDeg: number;
	/** (180° + ∠T) mod 360° in [0°, 360°). */
	lagMarginDeg: number;
	/** Unwrapped loop phase at the crossing. */
	phaseDeg: number;
	/** 'falling': |T| goes from above 1 to below 1 with rising frequency. */
	direction: 'falling' | 'rising';
}

export interface PhaseCrossover {
	freqHz: number;
	/** −20·log10|T|: > 0 the gain may rise by this much; < 0 it may fall by |value|. */
	gainMarginDb: number;
	/** The −180° + k·360° line crossed (deg). */
	lineDeg: number;
	/** 'falling': the phase decreases through the line. */
	direction: 'falling' | 'rising';
}

export interface LoopMetrics {
	/** The governing gain crossing: smallest |PM| (see the module note). */
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	/** The governing phase crossing's gain margin (smallest |GM dB|; negative = the gain may only fall) and where it is taken. */
	gainMarginDb: number | null;
	phaseCrossoverHz: number | null;
	/** Negative gain margin closest to zero (conditional stability), dB. */
	gainReductionMarginDb: number | null;
	/** min over crossings of lag margin / ωc, s (null when the closed loop is unstable). */
	delayMarginS: number | null;
	/** min |1 + T(jω)| over the analysed range, and where. */
	modulusMargin: number | null;
	modulusMarginHz: number | null;
	crossovers: GainCrossover[];
	phaseCrossovers: PhaseCrossover[];
	closedLoopStable: boolean | null;
	closedLoop: ClosedLoopResult | null;
	/** Why a null metric is null, by metric name. */
	unavailable: Partial<Record<'crossoverHz' | 'gainMarginDb' | 'gainReductionMarginDb' | 'delayMarginS' | 'modulusMargin' | 'closedLoopStable', string>>;
}

export interface MarginOptions extends GridOptions {
	/** Padé order for the delay in the closed-loop pole computation [chosen, see closedLoop.ts]. */
	padeOrder?: number;
	/** Skip the closed-loop pole computation [false]. */
	skipClosedLoop?: boolean;
	/** Compute the closed-loop poles [true]; false needs only the stability verdict, which a
	 * Routh–Hurwitz test gives without roots for a clearly stable loop (poles then empty). */
	closedLoopPoles?: boolean;
}

/** Reduce an angle in degrees to (−180, 180]. */
export function reduceDeg(x: number): number {
	let y = x - 360 * Math.floor((x + 180) / 360);
	if (y <= -180) y += 360;
	return y;
}

// The root and minimum searches take plain functions of u = ln ω; they read the loop being
// analysed from here (module-level functions rather than closures allocated per call).
const probe = { c: null as unknown as CompiledTf, line: 0, buf: new Float64Array(4) };

/** ln|T| and its slope at u = ln ω. */
function lnMagAndSlopeAtLog(u: number, out: Float64Array): void {
	lnMagPhaseSlopeAt(probe.c, Math.exp(u), probe.buf, u);
	out[0] = probe.buf[0];
	out[1] = probe.buf[2];
}

/** Phase less the current −180° + k·360° line, and its slope, at u = ln ω. */
function phaseLessLineAndSlopeAtLog(u: number, out: Float64Array): void {
	lnMagPhaseSlopeAt(probe.c, Math.exp(u), probe.buf, u);
	out[0] = probe.buf[1] - probe.line;
	out[1] = probe.buf[3];
}

/**
 * d|1 + T|²/d ln ω from ln|T|, the phase and their slopes: with |1 + T|² = 1 + 2m·cos φ + m²,
 * it is 2m·[λ'(m + cos φ) − φ'·sin φ] (λ = ln m) [derived here].
 */
function distanceSlope(lnMag: number, phase: number, lnMagSlope: number, phaseSlope: number): number {
	const m = Math.exp(lnMag);
	return 2 * m * (lnMagSlope * (m + Math.cos(phase)) - phaseSlope * Math.sin(phase));
}

/** d|1 + T|²/d ln ω at u = ln ω. */
function distanceSlopeAtLog(u: number): number {
	lnMagPhaseSlopeAt(probe.c, Math.exp(u), probe.buf, u);
	return distanceSlope(probe.buf[0], probe.buf[1], probe.buf[2], probe.buf[3]);
}

/** |1 + T| at u = ln ω. */
function distanceAtLog(u: number): number {
	lnMagPhaseAt(probe.c, Math.exp(u), probe.buf, u);
	return distanceToMinusOne(probe.buf[0], probe.buf[1]);
}

function isSortedByFreq(list: readonly { freqHz: number }[]): boolean {
	for (let i = 1; i < list.length; i++) if (list[i].freqHz < list[i - 1].freqHz) return false;
	return true;
}

function phaseCrossoverAt(c: CompiledTf, omega: number, lineRad: number, direction: 'falling' | 'rising'): PhaseCrossover {
	lnMagPhaseAt(c, omega, probe.buf);
	return { freqHz: omega / TWO_PI, gainMarginDb: (-20 * probe.buf[0]) / Math.LN10, lineDeg: lineRad * RAD2DEG, direction };
}

/** The governing gain crossing: smallest |PM|; on a tie the lower frequency (the list is sorted). */
export function governingCrossover<T extends { phaseMarginDeg: number }>(crossings: readonly T[]): T | null {
	let best: T | null = null;
	for (const x of crossings) if (!best || Math.abs(x.phaseMarginDeg) < Math.abs(best.phaseMarginDeg)) best = x;
	return best;
}

/** The governing phase crossing: smallest |GM dB|; on a tie the lower frequency. */
export function governingPhaseCrossover<T extends { gainMarginDb: number }>(crossings: readonly T[]): T | null {
	let best: T | null = null;
	for (const x of crossings) if (!best || Math.abs(x.gainMarginDb) < Math.abs(best.gainMarginDb)) best = x;
	return best;
}

export function loopMetrics(
	loop: FactoredTf,
	range: { startHz: number; stopHz: number },
	options: MarginOptions = {}
): LoopMetrics {
	const c = compileTf(loop);
	const wA = TWO_PI * range.startHz;
	const wB = TWO_PI * range.stopHz;
	const g = bracketingGrid(c, wA, wB, options); // scratch: read before any other grid is built
	const buf = probe.buf;
	probe.c = c;
	const n = g.n;

	// Gain crossovers: sign changes of ln|T| (a value of exactly 0 counts as positive, and a
	// last point of exactly 0 is a crossing at the edge). The grid makes ln|T| monotone on every
	// interval with a sign change, so each holds exactly one crossing.
	const crossovers: GainCrossover[] = [];
	for (let i = 1; i < n; i++) {
		const a = g.lnMag[i - 1];
		const b = g.lnMag[i];
		const atEdge = i === n - 1 && b === 0;
		if ((a >= 0) === (b >= 0) && !atEdge) continue;
		const u = atEdge ? g.logOmega[i] : newtonBracketed(lnMagAndSlopeAtLog, g.logOmega[i - 1], g.logOmega[i], a, b, 1e-12);
		const w = Math.exp(u);
		lnMagPhaseAt(c, w, buf);
		const phaseDeg = buf[1] * RAD2DEG;
		const pm = reduceDeg(180 + phaseDeg);
		crossovers.push({
			freqHz: w / TWO_PI,
			phaseMarginDeg: pm,
			lagMarginDeg: pm < 0 ? pm + 360 : pm,
			phaseDeg,
			direction: b < a ? 'falling' : 'rising'
		});
	}

	// Phase crossovers: the unwrapped phase crossing any −π + 2πk line.
	const phaseCrossovers: PhaseCrossover[] = [];
	const undamped = hasUndampedPair(c);
	const first = g.phase[0];
	if (Number.isInteger((first + Math.PI) / TWO_PI)) {
		phaseCrossovers.push(phaseCrossoverAt(c, g.omega[0], first, g.phase[1] < first ? 'falling' : 'rising'));
	}
	for (let i = 1; i < n; i++) {
		const pa = g.phase[i - 1];
		const pb = g.phase[i];
		if (pa === pb) continue;
		// Across an undamped pair's ω0 the phase jumps by ±180° while |T| passes through 0 (zero
		// pair) or ∞ (pole pair): the Nyquist curve goes through the origin or out to infinity,
		// never near −1, so a line the jump steps over is no phase crossover. The grid samples
		// ω0(1 ± 1e-9), so nothing else fits in that interval.
		if (undamped && containsUndampedPair(c, g.omega[i - 1], g.omega[i], true)) continue;
		const lo = Math.min(pa, pb);
		const hi = Math.max(pa, pb);
		// lines L_k = −π + 2πk with lo < L ≤ hi (falling) or lo ≤ L < hi (rising): each once
		const kMin = Math.ceil((lo + Math.PI) / TWO_PI);
		const kMax = Math.floor((hi + Math.PI) / TWO_PI);
		for (let k = kMin; k <= kMax; k++) {
			const line = -Math.PI + TWO_PI * k;
			if (line === pa) continue; // counted at the previous point
			probe.line = line;
			const u = newtonBracketed(phaseLessLineAndSlopeAtLog, g.logOmega[i - 1], g.logOmega[i], pa - line, pb - line, 1e-12);
			phaseCrossovers.push(phaseCrossoverAt(c, Math.exp(u), line, pb < pa ? 'falling' : 'rising'));
		}
	}
	if (!isSortedByFreq(phaseCrossovers)) phaseCrossovers.sort((a, b) => a.freqHz - b.freqHz);

	const unavailable: LoopMetrics['unavailable'] = {};
	const governing = governingCrossover(crossovers);
	if (!governing) {
		unavailable.crossoverHz =
			g.lnMag[0] < 0
				? '|T| stays below 0 dB over the analysed range'
				: '|T| stays above 0 dB over the analysed range (crossover above the range)';
	}

	const gm = governingPhaseCrossover(phaseCrossovers);
	let grm: PhaseCrossover | null = null;
	for (const p of phaseCrossovers) if (p.gainMarginDb < 0 && (!grm || p.gainMarginDb > grm.gainMarginDb)) grm = p;
	if (!gm) unavailable.gainMarginDb = 'the loop phase never reaches −180° (mod 360°) in the analysed range';
	if (!grm) unavailable.gainReductionMarginDb = 'no phase crossover with |T| > 1';

	// Modulus margin: the grid brackets the global minimum of |1 + T| to modulusRelTol; refine
	// each sampled local minimum that could hold it. Where d|1 + T|²/d ln ω (known at every
	// sample from its slopes) changes sign beside it, Brent's root finder on that derivative
	// converges in a few steps; otherwise (a minimum at a range edge) Brent's minimiser.
	const relTol = options.modulusRelTol ?? 0.01;
	let best = g.distance[g.iMinDistance];
	let smW = g.omega[g.iMinDistance];
	const limit = best * (1 + 2 * relTol);
	for (let i = 0; i < n && n > 1; i++) {
		const d = g.distance[i];
		if (d > limit || (i > 0 && g.distance[i - 1] < d) || (i < n - 1 && g.distance[i + 1] < d)) continue;
		const gi = distanceSlope(g.lnMag[i], g.phase[i], g.lnMagSlope[i], g.phaseSlope[i]);
		let j = -1; // bracket [j, j + 1] with the derivative rising through 0
		if (gi < 0 && i + 1 < n && distanceSlope(g.lnMag[i + 1], g.phase[i + 1], g.lnMagSlope[i + 1], g.phaseSlope[i + 1]) > 0) j = i;
		else if (gi > 0 && i > 0 && distanceSlope(g.lnMag[i - 1], g.phase[i - 1], g.lnMagSlope[i - 1], g.phaseSlope[i - 1]) < 0) j = i - 1;
		let x: number;
		let fx: number;
		if (gi === 0) {
			x = g.logOmega[i];
			fx = d;
		} else if (j >= 0) {
			const ga = distanceSlope(g.lnMag[j], g.phase[j], g.lnMagSlope[j], g.phaseSlope[j]);
			const gb = distanceSlope(g.lnMag[j + 1], g.phase[j + 1], g.lnMagSlope[j + 1], g.phaseSlope[j + 1]);
			x = brentRoot(distanceSlopeAtLog, g.logOmega[j], g.logOmega[j + 1], ga, gb, 1e-10);
			fx = distanceAtLog(x);
		} else {
			const r = brentMin(distanceAtLog, g.logOmega[Math.max(0, i - 1)], g.logOmega[Math.min(n - 1, i + 1)], 1e-9);
			x = r.x;
			fx = r.fx;
		}
		if (fx < best) {
			best = fx;
			smW = Math.exp(x);
		}
	}

	let closedLoop: ClosedLoopResult | null = null;
	let stable: boolean | null = null;
	if (!options.skipClosedLoop) {
		const highest = crossovers.length ? Math.max(...crossovers.map((x) => x.freqHz)) : range.stopHz;
		closedLoop = closedLoopStability(loop, { padeOrder: options.padeOrder, accurateToHz: 2 * highest, poles: options.closedLoopPoles });
		stable = closedLoop.stable;
		if (stable === null) unavailable.closedLoopStable = closedLoop.reason ?? 'closed-loop poles not available';
	}

	let delayMarginS: number | null = null;
	if (crossovers.length === 0) unavailable.delayMarginS = 'no gain crossover';
	else if (stable === false) unavailable.delayMarginS = 'the closed loop is unstable';
	else {
		delayMarginS = Math.min(...crossovers.map((x) => x.lagMarginDeg / 360 / x.freqHz));
	}

	return {
		crossoverHz: governing?.freqHz ?? null,
		phaseMarginDeg: governing?.phaseMarginDeg ?? null,
		gainMarginDb: gm?.gainMarginDb ?? null,
		phaseCrossoverHz: gm?.freqHz ?? null,
		gainReductionMarginDb: grm?.gainMarginDb ?? null,
		delayMarginS,
		modulusMargin: Number.isFinite(best) ? best : null,
		modulusMarginHz: Number.isFinite(best) ? smW / TWO_PI : null,
		crossovers,
		phaseCrossovers,
		closedLoopStable: stable,
		closedLoop,
		unavailable
	};
}
