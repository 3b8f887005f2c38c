/**
 * The highest crossover a placement aims for on its own (a new rail's starter, a template without
 * a crossover): the verdict's own fsw limit (targets.maxCrossoverFraction · fsw) and, for a boost,
 * a fifth of its lowest RHP zero, where the RHP zero's phase lag is still small [common practice,
 * docs/formulas.md §6.4]. One rule for the starter, the crossover warning and the verdict.
 */
import { DEFAULT_MARGIN_TARGETS } from '../contract/targetsSchema';
import type { EngineWarning } from '../errors';
import { formatEng } from '../../units/format';
import { boostRhpZeroOmega } from '../plants/stageModel';

/**
 * fc at or below this fraction of the RHP zero (a fifth) [common practice: design notes put fc at
 * 1/5 … 1/10 of fRHP; the zero adds gain while it takes phase, −atan(1/5) = −11.3° at a fifth].
 * The crossover warning, the verdict's fc row (at every corner) and the starter design use it.
 */
export const RHP_ZERO_CROSSOVER_FRACTION = 1 / 5;

/** Code of the warning (and of the verdict's caution) when the rule is broken. */
export const RHP_ZERO_RULE_CODE = 'crossover-above-rhp-limit';

/** The warning when fc is above a fifth of the RHP zero, else null. */
export function rhpZeroWarning(fcHz: number | null, rhpZeroHz: number | null): EngineWarning | null {
	if (fcHz === null || rhpZeroHz === null || !(rhpZeroHz > 0)) return null;
	const limit = RHP_ZERO_CROSSOVER_FRACTION * rhpZeroHz;
	if (!(fcHz > limit)) return null;
	const f = (x: number) => formatEng(x, 'Hz');
	return {
		code: RHP_ZERO_RULE_CODE,
		message:
			`Crossover ${f(fcHz)} is above a fifth of the RHP zero (${f(rhpZeroHz)}): the zero's phase lag cannot be ` +
			`compensated and it raises the gain. Keep fc at or below ${f(limit)}.`
	};
}

/**
 * Boost RHP zero in Hz from the stage's ratings, before any model is built: the plant's formula
 * (plants/stageModel.ts) with the lossless D′ = Vin/Vout and R = Vout/Iout; lowest at Vin min, Iout max.
 */
export function boostRhpZeroHz(p: { vin: number; vout: number; iout: number; l: number; rSeries?: number }): number {
	return boostRhpZeroOmega({ dPrime: p.vin / p.vout, rLoad: p.vout / p.iout, rSeries: p.rSeries ?? 0, l: p.l }) / (2 * Math.PI);
}

export function crossoverCeilingHz(p: { fswHz: number; maxCrossoverFraction: number; rhpZeroHz: number | null }): number {
	const fsw = p.maxCrossoverFraction * p.fswHz;
	return p.rhpZeroHz !== null && p.rhpZeroHz > 0 ? Math.min(fsw, RHP_ZERO_CROSSOVER_FRACTION * p.rhpZeroHz) : fsw;
}

/** The worst-case (lowest) RHP zero of a boost over its operating ranges; null for a buck. */
export function worstRhpZeroHz(topology: 'buck' | 'boost', p: { vinMin: number; vout: number; ioutMax: number; l: number }): number | null {
	return topology === 'boost' ? boostRhpZeroHz({ vin: p.vinMin, vout: p.vout, iout: p.ioutMax, l: p.l }) : null;
}

/** The crossover a design document's placement takes when it names none: fsw/10 under the ceiling above. */
export function defaultCrossoverHz(doc: {
	plant: { topology: 'buck' | 'boost'; vin: number; vout: number; iout: number; fsw: number; inductor: { l: number } };
	corners?: { vin?: { min: number }; iout?: { max: number } };
	targets?: { maxCrossoverFraction?: number };
}): number {
	const p = doc.plant;
	const rhp = worstRhpZeroHz(p.topology, { vinMin: Math.min(p.vin, doc.corners?.vin?.min ?? p.vin), vout: p.vout, ioutMax: Math.max(p.iout, doc.corners?.iout?.max ?? p.iout), l: p.inductor.l });
	return Math.min(p.fsw / 10, crossoverCeilingHz({ fswHz: p.fsw, maxCrossoverFraction: doc.targets?.maxCrossoverFraction ?? DEFAULT_MARGIN_TARGETS.maxCrossoverFraction, rhpZeroHz: rhp }));
}
