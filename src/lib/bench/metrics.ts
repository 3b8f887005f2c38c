/**
 * Loop margins read from measured points: gain crossovers where the dB curve changes sign, phase crossovers where the
 * unwrapped phase passes −180° + k·360°, each located by linear interpolation on log-frequency between the two
 * bracketing points (magnitude in dB and phase in degrees are both interpolated linearly in log f).
 * Definitions as the engine's (docs/formulas.md §7.1): PM = 180° + ∠T reduced to (−180°, 180°], GM = −|T|dB at ∠T = −180°;
 * the governing PM and GM are chosen by the engine's one rule (smallest |PM|, smallest |GM dB|: analysis/margins.ts).
 */
import { governingCrossover, governingPhaseCrossover } from '../engine/analysis/margins';
import type { BenchMetrics, MeasuredCrossover, MeasuredPhaseCrossover } from './types';

export interface MeasuredResponse {
	freqHz: readonly number[];
	magDb: readonly number[];
	phaseDeg: readonly number[];
}

/** Reduce an angle to (−180°, 180°]. */
export function reduceDeg(x: number): number {
	const r = x - 360 * Math.ceil((x - 180) / 360);
	return r === -180 ? 180 : r;
}

/** The point at fraction t of the way from index i to i+1, on log-frequency. */
function between(r: MeasuredResponse, i: number, t: number) {
	const lf = Math.log(r.freqHz[i]) + t * (Math.log(r.freqHz[i + 1]) - Math.log(r.freqHz[i]));
	return {
		freqHz: Math.exp(lf),
		magDb: r.magDb[i] + t * (r.magDb[i + 1] - r.magDb[i]),
		phaseDeg: r.phaseDeg[i] + t * (r.phaseDeg[i + 1] - r.phaseDeg[i])
	};
}

/** Every gain crossover of the measured loop, ascending in frequency. A point exactly at 0 dB counts once. */
export function measuredCrossovers(r: MeasuredResponse): MeasuredCrossover[] {
	const out: MeasuredCrossover[] = [];
	for (let i = 0; i + 1 < r.freqHz.length; i++) {
		const a = r.magDb[i];
		const b = r.magDb[i + 1];
		if (a === 0 && i > 0) continue; // counted as the end of the previous interval
		if (!(a === 0 || b === 0 || a > 0 !== b > 0)) continue;
		if (a === 0 && b === 0) continue;
		const t = a === b ? 0 : a / (a - b);
		const p = between(r, i, t);
		out.push({ freqHz: p.freqHz, phaseMarginDeg: reduceDeg(180 + p.phaseDeg) });
	}
	return out;
}

/** Every phase crossover (∠T = −180° + k·360°) with its gain margin, ascending in frequency. */
export function measuredPhaseCrossovers(r: MeasuredResponse): MeasuredPhaseCrossover[] {
	const out: MeasuredPhaseCrossover[] = [];
	for (let i = 0; i + 1 < r.freqHz.length; i++) {
		const a = r.phaseDeg[i];
		const b = r.phaseDeg[i + 1];
		if (a === b) continue;
		// Lines −180 + 360k inside [min, max) of this interval, in the order the curve meets them.
		const lo = Math.min(a, b);
		const hi = Math.max(a, b);
		const kFirst = Math.ceil((lo + 180) / 360);
		const kLast = Math.floor((hi + 180) / 360);
		const ks: number[] = [];
		for (let k = kFirst; k <= kLast; k++) {
			const level = -180 + 360 * k;
			// A level hit exactly by the interval's end is counted in the next interval (unless this is the last one).
			if (level === b && i + 2 < r.freqHz.length) continue;
			ks.push(k);
		}
		if (b < a) ks.reverse();
		for (const k of ks) {
			const level = -180 + 360 * k;
			const t = (level - a) / (b - a);
			const p = between(r, i, t);
			out.push({ freqHz: p.freqHz, gainMarginDb: -p.magDb });
		}
	}
	return out;
}

/** Margins of a measured loop gain; null (with a note) where the measured band holds no such crossing. */
export function benchMetrics(r: MeasuredResponse): BenchMetrics {
	const crossovers = measuredCrossovers(r);
	const phaseCrossovers = measuredPhaseCrossovers(r);
	const notes: string[] = [];
	const governing: MeasuredCrossover | null = governingCrossover(crossovers);
	const gm: MeasuredPhaseCrossover | null = governingPhaseCrossover(phaseCrossovers);
	const n = r.freqHz.length;
	if (governing === null && n > 0) {
		notes.push(
			r.magDb.every((m) => m > 0)
				? 'the measured gain stays above 0 dB; no crossover inside the measured band'
				: 'the measured gain stays below 0 dB; no crossover inside the measured band'
		);
	}
	if (gm === null) {
		notes.push('the measured phase never reaches −180°; no gain margin inside the measured band');
	}
	return {
		crossoverHz: governing?.freqHz ?? null,
		phaseMarginDeg: governing?.phaseMarginDeg ?? null,
		gainMarginDb: gm?.gainMarginDb ?? null,
		phaseCrossoverHz: gm?.freqHz ?? null,
		crossovers,
		phaseCrossovers,
		notes
	};
}
