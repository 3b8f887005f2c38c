/**
 * The highest crossover a placement aims for on its own (a new rail's starter, a template without
 * a crossover): the verdict's own fsw limit (targets.maxCrossoverFraction · fsw) and, for a boost,
 * a fifth of its lowest RHP zero, where the RHP zero's phase lag is still small [common practice,
 * domain sheet §6.4; the same fifth the crossover warnings of checks.ts advise]. One rule for both.
 */
import { DEFAULT_MARGIN_TARGETS } from '../contract/targetsSchema';

/** fc at or below this fraction of the RHP zero (a fifth). */
export const RHP_ZERO_CROSSOVER_FRACTION = 1 / 5;
/** Above this fraction of the RHP zero the crossover warning fires (a third). */
export const RHP_ZERO_WARNING_FRACTION = 1 / 3;

/** Boost RHP zero (D'²R − r)/(2πL) with D' = Vin/Vout and R = Vout/Iout: lowest at Vin min, Iout max. */
export function boostRhpZeroHz(p: { vin: number; vout: number; iout: number; l: number; rSeries?: number }): number {
	const dc = p.vin / p.vout;
	return (dc * dc * (p.vout / p.iout) - (p.rSeries ?? 0)) / (2 * Math.PI * p.l);
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
