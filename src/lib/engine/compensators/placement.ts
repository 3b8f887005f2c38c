// Placement of the compensator's corners for a target: K-factor (Venable 1983, docs/formulas.md §6.1–§6.2), plant
// features (§6.4 common practice: zeros relative to f0, poles at the ESR zero and fsw/2, gain for |T(fc)| = 1) and
// manual (user corners, gain from the crossover or a mid-band gain). Output is a NetworkShape (synthesis/networks)
// plus plain-words notes; the ideal K-factor shape hits fc and PM exactly (§6.2 exactness).
import { evaluatePolar, type FactoredTf } from '../tf';
import {
	fmtHz,
	pairType3,
	shapeProblem,
	withGainAt,
	withMidbandGain,
	type CompensatorKind,
	type NetworkShape
} from '../synthesis/networks';
import type { CompensatorTarget } from './schema';
import { formatDeg } from '../../units/format';

export interface DesignWarning {
	code: string;
	message: string;
}

/** Raised when a requested network cannot be built at all; `field` is the design-document path to blame. */
export class CompensatorDesignError extends Error {
	/** Every offending field (document path → rule), for the contract's `error.fields`. */
	readonly fields: Record<string, string>;
	constructor(
		message: string,
		readonly field: string,
		readonly code: 'compensator-infeasible' | 'invalid-design' = 'compensator-infeasible',
		fields?: Record<string, string>
	) {
		super(message);
		this.name = 'CompensatorDesignError';
		this.fields = fields ?? { [field]: message };
	}
}

export interface PlantFeatures {
	f0Hz: number;
	q: number;
	esrZeroHz: number[];
	rhpZeroHz: number | null;
}

export interface PlacementContext {
	plant: FactoredTf;
	fswHz: number;
	features: PlantFeatures;
}

export interface Placement {
	shape: NetworkShape;
	/** K-factor details when that method ran. */
	kFactor?: { k: number; requiredBoostDeg: number; usedBoostDeg: number; plantPhaseDeg: number; gain: number };
	notes: DesignWarning[];
}

/** Boost the K-factor formulas can deliver, by kind: Type I 0°, Type II < 90°, Type III < 180° (§6.1). */
export const BOOST_LIMIT_DEG: Record<CompensatorKind, number> = { type1: 0, type2: 90, 'type2-ota': 90, type3: 180 };
/** Usable window kept inside the limits so K stays finite and > 1 (realisable parts). */
const BOOST_MARGIN_DEG = 5;

const deg = formatDeg;

/** |P| and unwrapped ∠P (deg) of the plant at f. */
function plantAt(plant: FactoredTf, freqHz: number) {
	const { magDb, phaseDeg } = evaluatePolar(plant, 2 * Math.PI * freqHz);
	return { mag: 10 ** (magDb / 20), phaseDeg };
}

/** Boost = PM − ∠P(fc) − 90° (§6.1). */
export function requiredBoostDeg(plant: FactoredTf, fcHz: number, pmDeg: number): number {
	return pmDeg - plantAt(plant, fcHz).phaseDeg - 90;
}

/** K for a boost (§6.2): Type II tan(B/2 + 45°), Type III tan²(B/4 + 45°); Type I 1. */
export function kFactorFor(kind: CompensatorKind, boostDeg: number): number {
	const rad = Math.PI / 180;
	if (kind === 'type1') return 1;
	if (kind === 'type3') return Math.tan((boostDeg / 4 + 45) * rad) ** 2;
	return Math.tan((boostDeg / 2 + 45) * rad);
}

/** Boost a K delivers at fc (§6.2): Type II 2·atan(K) − 90°, Type III 4·atan(√K) − 180°. */
export function boostForK(kind: CompensatorKind, k: number): number {
	const d = 180 / Math.PI;
	if (kind === 'type1') return 0;
	if (kind === 'type3') return 4 * Math.atan(Math.sqrt(k)) * d - 180;
	return 2 * Math.atan(k) * d - 90;
}

/** Highest fc below `fcHz` (down to fc/1000) whose required boost fits `limitDeg`, or null. */
function highestFeasibleFc(plant: FactoredTf, fcHz: number, pmDeg: number, limitDeg: number): number | null {
	for (let i = 1; i <= 150; i++) {
		const f = fcHz * 10 ** (-i / 50);
		if (requiredBoostDeg(plant, f, pmDeg) <= limitDeg) return f;
	}
	return null;
}

export function placeKFactor(kind: CompensatorKind, ctx: PlacementContext, fcHz: number, pmDeg: number): Placement {
	const notes: DesignWarning[] = [];
	const p = plantAt(ctx.plant, fcHz);
	const gain = 1 / p.mag;
	const required = pmDeg - p.phaseDeg - 90;
	const limit = BOOST_LIMIT_DEG[kind];
	const typeName = kindName(kind);
	let used = required;
	if (kind === 'type1') {
		if (required > 0) {
			const fit = highestFeasibleFc(ctx.plant, fcHz, pmDeg, 0);
			notes.push({
				code: 'boost-exceeds-type',
				message:
					`PM ${deg(pmDeg)} at ${fmtHz(fcHz)} needs ${deg(required)} of phase boost, but a Type I integrator gives none ` +
					`(it reaches about ${deg(90 + p.phaseDeg)}). Use a Type II or Type III` +
					(fit ? `, or lower the crossover to about ${fmtHz(fit)}.` : '.')
			});
		}
		used = 0;
	} else {
		const hi = limit - BOOST_MARGIN_DEG;
		if (required >= 180) {
			notes.push({
				code: 'boost-infeasible',
				message:
					`PM ${deg(pmDeg)} at ${fmtHz(fcHz)} needs ${deg(required)} of phase boost; no Type I/II/III gives 180° or more. ` +
					`Lower the crossover (the plant lags less further down) or change the power stage.`
			});
		} else if (required > hi) {
			const fit = highestFeasibleFc(ctx.plant, fcHz, pmDeg, hi);
			const options = [
				kind !== 'type3' && required < BOOST_LIMIT_DEG.type3 - BOOST_MARGIN_DEG ? 'use a Type III' : null,
				fit ? `lower the crossover to about ${fmtHz(fit)} or below` : null,
				'accept a lower phase margin'
			].filter((x): x is string => x !== null);
			notes.push({
				code: 'boost-exceeds-type',
				message:
					`PM ${deg(pmDeg)} at ${fmtHz(fcHz)} needs ${deg(required)} of phase boost; a ${typeName} gives less than ` +
					`${deg(limit)} (this design uses ${deg(hi)}, so PM comes out near ${deg(pmDeg - required + hi)}). ` +
					`To reach the target: ${options.join(', or ')}.`
			});
		}
		if (required < BOOST_MARGIN_DEG) {
			notes.push({
				code: 'boost-not-needed',
				message:
					`The plant already gives PM ${deg(pmDeg)} at ${fmtHz(fcHz)} with ${deg(Math.max(required, 0))} of boost; ` +
					`the ${typeName} uses the minimum ${deg(BOOST_MARGIN_DEG)}, so PM comes out above target. A simpler type would do.`
			});
		}
		used = Math.min(Math.max(required, BOOST_MARGIN_DEG), hi);
	}
	const k = kFactorFor(kind, used);
	let shape: NetworkShape;
	if (kind === 'type1') shape = { kind, integratorHz: 1 };
	else if (kind === 'type3') {
		const r = Math.sqrt(k);
		shape = { kind, integratorHz: 1, zero1Hz: fcHz / r, pole1Hz: fcHz * r, zero2Hz: fcHz / r, pole2Hz: fcHz * r };
	} else shape = { kind, integratorHz: 1, zeroHz: fcHz / k, poleHz: fcHz * k };
	shape = withGainAt(shape, fcHz, gain);
	return { shape, kFactor: { k, requiredBoostDeg: required, usedBoostDeg: used, plantPhaseDeg: p.phaseDeg, gain }, notes };
}

export function placeByFeatures(kind: CompensatorKind, ctx: PlacementContext, target: CompensatorTarget): Placement {
	const fcHz = target.crossoverHz!;
	const { f0Hz } = ctx.features;
	const notes: DesignWarning[] = [];
	const nCorners = kind === 'type1' ? 0 : kind === 'type3' ? 2 : 1;
	const zerosRel = target.zerosRelF0 ?? new Array<number>(nCorners).fill(1);
	if (zerosRel.length !== nCorners) {
		throw new CompensatorDesignError(`must list ${nCorners} multiples of f0 for ${kind}`, 'compensator.target.zerosRelF0');
	}
	const zerosHz = zerosRel.map((m) => m * f0Hz);
	let polesHz: number[];
	if (target.polesRelFsw) {
		if (target.polesRelFsw.length !== nCorners) {
			throw new CompensatorDesignError(`must list ${nCorners} fractions of fsw for ${kind}`, 'compensator.target.polesRelFsw');
		}
		polesHz = target.polesRelFsw.map((r) => r * ctx.fswHz);
	} else {
		const half = ctx.fswHz / 2;
		const esr = ctx.features.esrZeroHz.length ? Math.min(...ctx.features.esrZeroHz) : null;
		const highestZero = zerosHz.length ? Math.max(...zerosHz) : 0;
		const esrPole = esr !== null && esr < half && esr > highestZero ? esr : half;
		if (esr !== null && esrPole !== esr && nCorners > 0) {
			notes.push({
				code: 'esr-pole-moved',
				message:
					esr >= half
						? `The ESR zero (${fmtHz(esr)}) is above fsw/2, so the first pole sits at fsw/2 (${fmtHz(half)}).`
						: `The ESR zero (${fmtHz(esr)}) is below the compensator zeros, so a pole there cannot be built; it sits at fsw/2.`
			});
		}
		const rhp = ctx.features.rhpZeroHz;
		const secondPole = rhp !== null && rhp < half ? rhp : half;
		polesHz = kind === 'type3' ? [esrPole, secondPole] : nCorners === 1 ? [esrPole] : [];
	}
	let shape = shapeWithCorners(kind, zerosHz, polesHz, 'compensator.target');
	const p = plantAt(ctx.plant, fcHz);
	shape = withGainAt(shape, fcHz, 1 / p.mag);
	return { shape, notes };
}

export function placeManually(kind: CompensatorKind, ctx: PlacementContext, target: CompensatorTarget): Placement {
	let shape = shapeWithCorners(kind, target.zerosHz ?? [], target.polesHz ?? [], 'compensator.target');
	if (target.midbandGainDb !== undefined) shape = withMidbandGain(shape, 10 ** (target.midbandGainDb / 20));
	else shape = withGainAt(shape, target.crossoverHz!, 1 / plantAt(ctx.plant, target.crossoverHz!).mag);
	return { shape, notes: [] };
}

/** A shape (integrator 1 Hz, rescaled later) from free corner lists; throws a plain-words error if unbuildable. */
function shapeWithCorners(kind: CompensatorKind, zerosHz: number[], polesHz: number[], field: string): NetworkShape {
	let shape: NetworkShape;
	if (kind === 'type1') shape = { kind, integratorHz: 1 };
	else if (kind === 'type3') shape = { kind, integratorHz: 1, ...pairType3(zerosHz, polesHz) };
	else shape = { kind, integratorHz: 1, zeroHz: zerosHz[0], poleHz: polesHz[0] };
	const problem = shapeProblem(shape);
	if (problem) {
		throw new CompensatorDesignError(
			`${kindName(kind)} cannot be built: ${problem}. Move that zero below its pole (lower the zeros or raise the poles).`,
			field
		);
	}
	return shape;
}

export function kindName(kind: CompensatorKind): string {
	return kind === 'type1' ? 'Type I' : kind === 'type2' ? 'Type II' : kind === 'type3' ? 'Type III' : 'Type II (OTA)';
}
