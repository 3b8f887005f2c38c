// Public entry of compensator design: resolveCompensator(doc, ctx) turns the design document's `compensator`
// section into ideal and rounded parts, their corners, the Gc to build (tf/ factored form) and plain-words warnings,
// with the achieved crossover and phase margin computed from the loop response, never assumed.
// Formulas: docs/formulas.md §5 (networks), §6 (placement), §7 (margins), §10 (E-series).
import type { ZodError } from 'zod';
import { multiply, rootFreqHz, type FactoredTf } from '../tf';
import { isInSeries } from '../synthesis/eSeries';
import {
	bottomResistor,
	dividerVout,
	partsFromShape,
	partsRecord,
	type CompensatorKind,
	type NetworkParts
} from '../synthesis/networks';
import { partWarnings } from '../synthesis/practicality';
import { DEFAULT_SERIES, partFamily, roundParts, type SeriesChoice } from '../synthesis/rounding';
import { crossoverWarnings, loopWarnings, opampWarnings, poleWarnings } from './checks';
import { loopMetrics, type LoopMetrics } from '../analysis/margins';
import { checkLoop, loopCheckFromMetrics, type LoopCheck } from './loopCheck';
import {
	CompensatorDesignError,
	placeByFeatures,
	placeKFactor,
	placeManually,
	type DesignWarning,
	type Placement,
	type PlantFeatures
} from './placement';
import { compensatorSchema, hasNetworkParts, type CompensatorDoc } from './schema';
import { compensatorTf, idealCompensatorTf } from './transfer';
import { refinePlacement } from './refine';
import { zodFields } from '../contract/errors';
import { fmtHz } from '../synthesis/networks';
import { formatDeg, formatEng, formatPart, formatPercent } from '../../units/format';

export { compensatorSchema, type CompensatorDoc } from './schema';
export { CompensatorDesignError, type DesignWarning, type PlantFeatures } from './placement';
export { compensatorTf, idealCompensatorTf, finiteOpampCompensatorTf, type OpampModel } from './transfer';
export { checkLoop, loopCheckFromMetrics, type LoopCheck, type CrossoverPoint } from './loopCheck';
export { kFactorFor, boostForK, requiredBoostDeg } from './placement';

export interface CompensatorContext {
	/** Everything in the loop except Gc: Fm·Gvd (the divider is inside Gc for type2-ota). */
	plant: FactoredTf;
	fswHz: number;
	features: PlantFeatures;
	vout: number;
	vref: number;
	/** Divider top resistor, Ω (feedback.r1); kept as entered. */
	r1: number;
	/**
	 * The caller's own metrics range, Hz. When given, the built loop is analysed once over the
	 * union of it and the compensator's check range, with closed-loop poles, and the result comes
	 * back as `builtLoopMetrics` for the caller to reuse (analyzeDesign does).
	 */
	metricsRangeHz?: { startHz: number; stopHz: number };
	/** With metricsRangeHz: compute the closed-loop poles too [true]. */
	closedLoopPoles?: boolean;
	/** Fm·Gvd at the other operating cases, for target.placeFor 'worst-corner' (pipeline builds them). */
	cornerPlants?: FactoredTf[];
}

export interface NetworkReport {
	/** r1, rb (absent when Vout = Vref), r2, r3, c1, c2, c3, gm, ro as applicable; SI units. */
	parts: Record<string, number>;
	/** Finite zeros of the ideal-amplifier network, ascending, Hz. */
	zerosHz: number[];
	/** Poles, ascending, Hz; 0 is the integrator at the origin. */
	polesHz: number[];
}

export interface AchievedLoop {
	/** Governing crossing (smallest |PM|, analysis/margins.ts); null when there is none. */
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	crossovers: { freqHz: number; phaseMarginDeg: number }[];
}

export interface ResolvedCompensator {
	kind: CompensatorKind;
	ideal: NetworkReport;
	rounded: NetworkReport | null;
	/** Gc that would be built (rounded parts when a series is set, else ideal; finite op-amp if given). */
	built: FactoredTf;
	warnings: DesignWarning[];
	/** Loop figures from the response: T = Gc·plant for the ideal and for the rounded parts. */
	achieved: { ideal: AchievedLoop; rounded: AchievedLoop | null };
	/** How the network was obtained; K-factor details when used. */
	placement: { method: 'parts' | 'k-factor' | 'features' | 'manual'; k?: number; requiredBoostDeg?: number; usedBoostDeg?: number };
	/** T = built Gc · plant. */
	builtLoop: FactoredTf;
	/** Full metrics of builtLoop over builtLoopRangeHz (closed-loop poles only with ctx.metricsRangeHz). */
	builtLoopMetrics: LoopMetrics;
	builtLoopRangeHz: { startHz: number; stopHz: number };
}

/**
 * Resolve the design document's `compensator` section for a plant.
 * Throws CompensatorDesignError (with `field`, a document path) when the input is invalid or the network cannot be
 * built at all; every softer problem comes back as a warning with the design still produced.
 */
export function resolveCompensator(doc: CompensatorDoc, ctx: CompensatorContext): ResolvedCompensator {
	const parsed = compensatorSchema.safeParse(doc);
	if (!parsed.success) throw fromZod(parsed.error);
	return resolveParsedCompensator(parsed.data, ctx);
}

/** resolveCompensator for a section already validated by compensatorSchema (the design document's schema does). */
export function resolveParsedCompensator(c: CompensatorDoc, ctx: CompensatorContext): ResolvedCompensator {
	checkContext(ctx);
	const rb = bottomResistor(ctx.r1, ctx.vout, ctx.vref);
	const warnings: DesignWarning[] = [];

	let placement: Placement | null = null;
	let ideal: NetworkParts;
	const givenParts = hasNetworkParts(c.parts) || !c.target;
	if (givenParts) {
		ideal = partsFromDoc(c.kind, c.parts!, ctx.r1, rb);
	} else {
		const t = c.target!;
		const pctx = { plant: ctx.plant, fswHz: ctx.fswHz, features: ctx.features };
		const partsOf = (p: Placement) => partsFromShape(p.shape, { r1: ctx.r1, rb, gm: c.parts?.gm, ro: c.parts?.ro });
		const place = (fcHz: number, pmDeg: number): Placement =>
			t.method === 'k-factor' ? placeKFactor(c.kind, pctx, fcHz, pmDeg) : placeByFeatures(c.kind, pctx, { ...t, crossoverHz: fcHz });
		const cornerPlants = t.method === 'k-factor' && t.placeFor === 'worst-corner' ? (ctx.cornerPlants ?? []) : [];
		// A finite op-amp or the corners move the built loop off the request: re-place until it meets it (refine.ts).
		const refine = t.method !== 'manual' && c.kind !== 'type2-ota' && (c.opamp !== undefined || cornerPlants.length > 0);
		if (t.method === 'manual') placement = placeManually(c.kind, pctx, t);
		else if (!refine) placement = place(t.crossoverHz!, t.phaseMarginDeg ?? 0);
		else {
			const r = refinePlacement({
				fcHz: t.crossoverHz!,
				pmDeg: t.phaseMarginDeg ?? 0,
				targetsFc: true,
				place,
				partsOf,
				plant: ctx.plant,
				opamp: c.opamp ?? null,
				cornerPlants,
				rangeHz: analysisRange(ctx, [])
			});
			placement = r.placement;
			// The notes of the first placement would describe a request the user did not make.
			placement = { ...placement, notes: placement.notes.filter((n) => n.code !== 'boost-not-needed') };
			if (r.shortfall) {
				warnings.push({
					code: 'placement-target-missed',
					message: `Placement ${cornerPlants.length ? 'for the worst corner' : 'with the op-amp model'} could not meet the request: ${r.shortfall} (built loop: fc ${fmtHz(r.achieved.fcHz ?? 0)}, PM ${formatDeg(r.achieved.pmDeg ?? 0)}${cornerPlants.length ? `, worst-corner PM ${formatDeg(r.achieved.worstPmDeg ?? 0)}` : ''}).`
				});
			}
		}
		warnings.push(...placement.notes);
		ideal = partsOf(placement);
	}

	const series: SeriesChoice | null = c.series === undefined ? DEFAULT_SERIES : c.series;
	const rounds = !givenParts && series !== null && (series.resistors !== null || series.capacitors !== null);
	const rounded = rounds ? roundParts(ideal, series!) : null;
	if (givenParts && series) warnings.push(...notInSeries(ideal, series));

	const opamp = c.opamp ?? null;
	const builtParts = rounded ?? ideal;
	const built = compensatorTf(builtParts, opamp);
	// Without an op-amp model the built Gc of unrounded parts is the ideal one: no need to rebuild it.
	const idealReport = report(ideal, !rounded && !opamp ? built : undefined);
	const builtReport = rounded ? report(rounded) : idealReport;
	const range = analysisRange(ctx, [...idealReport.polesHz, ...idealReport.zerosHz]);
	// One metrics pass on the built loop; poles only when the caller will reuse the metrics,
	// otherwise the stability verdict (Routh–Hurwitz when clearly stable) is all the checks need.
	const wanted = ctx.metricsRangeHz;
	const builtRange = wanted
		? { startHz: Math.min(range.startHz, wanted.startHz), stopHz: Math.max(range.stopHz, wanted.stopHz) }
		: range;
	const builtLoop = multiply(built, ctx.plant);
	const builtLoopMetrics = loopMetrics(builtLoop, builtRange, { closedLoopPoles: wanted !== undefined && ctx.closedLoopPoles !== false });
	const builtCheck = loopCheckFromMetrics(builtLoopMetrics);
	const roundedLoop = rounded ? builtCheck : null;
	const idealLoop = rounded
		? checkLoop(multiply(compensatorTf(ideal, opamp), ctx.plant), range.startHz, range.stopHz, { closedLoopPoles: false })
		: builtCheck;

	const fcForChecks = c.target?.crossoverHz ?? builtCheck.crossoverHz;
	if (fcForChecks !== null) warnings.push(...crossoverWarnings(fcForChecks, ctx.fswHz, ctx.features));
	// Judged on the placed (ideal) corners: rounding moves them a few percent, which the achieved margins show.
	warnings.push(...poleWarnings(idealReport.polesHz, ctx.fswHz));
	const loopNotes = loopWarnings(builtCheck, c.target);
	warnings.push(...loopNotes);
	// Advice to simplify the network would be wrong on a loop that oscillates.
	if (loopNotes.some((w) => w.code === 'unstable')) {
		const i = warnings.findIndex((w) => w.code === 'boost-not-needed');
		if (i >= 0) warnings.splice(i, 1);
	}
	warnings.push(...partWarnings(builtParts));
	if (opamp && fcForChecks !== null) warnings.push(...opampWarnings(builtParts, opamp, fcForChecks, builtReport.polesHz));
	if (rounded && ideal.rb !== null && rounded.rb !== null) {
		const shift = dividerVout(rounded, ctx.vref) / ctx.vout - 1;
		if (Math.abs(shift) > 0.005) {
			warnings.push({
				code: 'divider-vout-shift',
				message: `Rounding Rb to ${formatPart(rounded.rb, 'Ω')} sets Vout to ${formatEng(ctx.vout * (1 + shift), 'V', { digits: 4 })} (${shift > 0 ? '+' : ''}${formatPercent(shift)}); choose R1 so Rb lands on a series value.`
			});
		}
	}

	return {
		kind: c.kind,
		ideal: idealReport,
		rounded: rounded ? builtReport : null,
		built,
		warnings,
		achieved: { ideal: achieved(idealLoop), rounded: roundedLoop ? achieved(roundedLoop) : null },
		placement: placement?.kFactor
			? { method: 'k-factor', k: placement.kFactor.k, requiredBoostDeg: placement.kFactor.requiredBoostDeg, usedBoostDeg: placement.kFactor.usedBoostDeg }
			: { method: givenParts ? 'parts' : c.target!.method },
		builtLoop,
		builtLoopMetrics,
		builtLoopRangeHz: builtRange
	};
}

function partsFromDoc(kind: CompensatorKind, p: NonNullable<CompensatorDoc['parts']>, r1: number, rb: number | null): NetworkParts {
	// The schema guarantees the parts each kind needs.
	switch (kind) {
		case 'type1':
			return { kind, r1, rb, c1: p.c1! };
		case 'type2':
			return { kind, r1, rb, r2: p.r2!, c1: p.c1!, c2: p.c2! };
		case 'type3':
			return { kind, r1, rb, r2: p.r2!, r3: p.r3!, c1: p.c1!, c2: p.c2!, c3: p.c3! };
		case 'type2-ota': {
			const out: NetworkParts = { kind, r1, rb, gm: p.gm!, r2: p.r2!, c1: p.c1!, c2: p.c2! };
			if (p.ro !== undefined) out.ro = p.ro;
			return out;
		}
	}
}

/** Parts and ideal-amplifier corners of a network, for the response. */
function report(parts: NetworkParts, idealTf: FactoredTf = idealCompensatorTf(parts)): NetworkReport {
	const tf = idealTf;
	return {
		parts: partsRecord(parts),
		zerosHz: cornersHz(tf.originPower, tf.zeros),
		polesHz: cornersHz(-tf.originPower, tf.poles)
	};
}

/** n zeros at the origin, then each factor's corner (a pair twice), ascending, Hz. */
function cornersHz(originCount: number, list: FactoredTf['zeros']): number[] {
	const out: number[] = [];
	for (let i = 0; i < originCount; i++) out.push(0);
	for (const r of list) {
		const f = rootFreqHz(r);
		out.push(f);
		if (r.kind === 'pair') out.push(f);
	}
	// Insertion sort: two to five values (Array#sort allocates a work array each call).
	for (let i = 1; i < out.length; i++) {
		const v = out[i];
		let j = i - 1;
		while (j >= 0 && out[j] > v) {
			out[j + 1] = out[j];
			j--;
		}
		out[j + 1] = v;
	}
	return out;
}

function achieved(loop: LoopCheck): AchievedLoop {
	return { crossoverHz: loop.crossoverHz, phaseMarginDeg: loop.phaseMarginDeg, crossovers: loop.crossovers };
}

/** Range for the loop check: three decades below the lowest feature to a decade above fsw. */
function analysisRange(ctx: CompensatorContext, cornersHz: number[]) {
	const finite = cornersHz.filter((f) => f > 0);
	const low = Math.min(ctx.features.f0Hz, ...finite, ctx.fswHz / 100);
	const high = Math.max(ctx.fswHz, ...finite);
	return { startHz: low / 1000, stopHz: high * 10 };
}

function notInSeries(parts: NetworkParts, series: SeriesChoice): DesignWarning[] {
	const out: DesignWarning[] = [];
	const record = parts as unknown as Record<string, unknown>;
	for (const name in record) {
		const value = record[name];
		if (name === 'kind' || name === 'r1' || name === 'rb' || typeof value !== 'number') continue;
		const family = partFamily(name);
		const s = family === 'resistor' ? series.resistors : family === 'capacitor' ? series.capacitors : null;
		if (s && !isInSeries(value, s)) {
			out.push({ code: 'part-not-in-series', message: `${name.toUpperCase()} = ${formatPart(value, family === 'resistor' ? 'Ω' : 'F')} is not an ${s} value.` });
		}
	}
	return out;
}

function bad(field: string, rule: string): CompensatorDesignError {
	return new CompensatorDesignError(`${field} ${rule}`, field, 'invalid-design');
}

function checkContext(ctx: CompensatorContext): void {
	if (!(ctx.r1 > 0 && Number.isFinite(ctx.r1))) throw bad('feedback.r1', 'must be > 0');
	if (!(ctx.vref > 0 && Number.isFinite(ctx.vref))) throw bad('feedback.vref', 'must be > 0');
	if (!(ctx.vout >= ctx.vref)) throw bad('feedback.vref', 'must not exceed the output voltage');
	if (!(ctx.fswHz > 0 && Number.isFinite(ctx.fswHz))) throw bad('plant.fsw', 'must be > 0');
	if (!(ctx.features.f0Hz > 0)) throw bad('plant', 'has no LC resonance (f0 must be > 0)');
}

function fromZod(error: ZodError): CompensatorDesignError {
	const fields = zodFields(error, ['compensator']);
	const [field, message] = Object.entries(fields)[0];
	return new CompensatorDesignError(`${field} ${message}`, field, 'invalid-design', fields);
}
