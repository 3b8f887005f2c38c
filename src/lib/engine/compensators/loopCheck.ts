// The compensator's view of a loop: every gain crossover with its phase margin, the governing one, conditional
// stability (a −180° crossing while |T| > 1) and the closed-loop verdict, all from the engine's margins module
// (analysis/margins.ts, docs/formulas.md §7.1–§7.5), so placement and the analysis response agree exactly.
import { loopMetrics, type LoopMetrics, type MarginOptions } from '../analysis/margins';
import type { FactoredTf } from '../tf';

export interface CrossoverPoint {
	freqHz: number;
	/** 180° + ∠T, reduced to (−180°, 180°]. */
	phaseMarginDeg: number;
}

export interface LoopCheck {
	/** Every |T| = 1 crossing, ascending. */
	crossovers: CrossoverPoint[];
	/** The governing crossing, smallest |PM| (analysis/margins.ts; null when |T| never crosses 1 in the range). */
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	/** The governing gain margin, smallest |GM| in dB (null when the phase never reaches −180°). */
	gainMarginDb: number | null;
	/** Where the phase crosses −180° + k·360° while |T| > 1 (nearest-to-zero such crossing), or null. */
	conditionalAtHz: number | null;
	/** The negative gain margin there, dB (the loop gain may fall by this much before instability). */
	gainReductionMarginDb: number | null;
	/** From the closed-loop poles; null when they could not be computed. */
	closedLoopStable: boolean | null;
}

export function checkLoop(loop: FactoredTf, startHz: number, stopHz: number, options: MarginOptions = {}): LoopCheck {
	return loopCheckFromMetrics(loopMetrics(loop, { startHz, stopHz }, options));
}

/** The compensator's view of loop metrics already computed (one metrics pass serves both). */
export function loopCheckFromMetrics(m: LoopMetrics): LoopCheck {
	let conditional: { freqHz: number; gainMarginDb: number } | null = null;
	for (const p of m.phaseCrossovers) {
		if (p.gainMarginDb < 0 && (conditional === null || p.gainMarginDb > conditional.gainMarginDb)) conditional = p;
	}
	return {
		crossovers: m.crossovers.map((c) => ({ freqHz: c.freqHz, phaseMarginDeg: c.phaseMarginDeg })),
		crossoverHz: m.crossoverHz,
		phaseMarginDeg: m.phaseMarginDeg,
		gainMarginDb: m.gainMarginDb,
		conditionalAtHz: conditional?.freqHz ?? null,
		gainReductionMarginDb: conditional?.gainMarginDb ?? null,
		closedLoopStable: m.closedLoopStable
	};
}
