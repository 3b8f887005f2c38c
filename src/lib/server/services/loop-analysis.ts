// Everything the review page, the exports and the sign-off report compute from one stored
// loop revision with the engine: the nominal analysis (the design as saved), the rail's
// corners on the same grid with the parts as built (rounded where a series is set, so corners
// vary the power stage only, as the board would), the closed-loop step responses, a small
// seeded Monte Carlo spread, and the parameter differences to another revision.
import { analyzeDesign, analyzeDesignDetailed, type AnalysisDetail } from '../../engine/analyze';
import type { AnalysisResponse } from '../../engine/contract/responseSchema';
import type { DesignDocument } from '../../engine/contract/designSchema';
import type { ContractError } from '../../engine/contract/errors';
import { analyzeClosedLoop } from '../../engine/closedloop/analyzeClosedLoop';
import { closedLoopInputOf } from '../../engine/closedloop/sections';
import { loopSpecFromDetail } from '../../engine/corners/loopModel';
import type { PartName } from '../../engine/corners/variation';
import { runSpread, type PartTolerance } from '../../engine/spread/spread';
import { railCorners, type RailOperatingRange } from '../../corners';
import type { MarginTargets, RailTolerances } from './types';

const PART_KEYS = ['r2', 'r3', 'c1', 'c2', 'c3', 'gm', 'ro'] as const;

export interface CornerAnalysis {
	label: string;
	vin: number;
	iout: number;
	response: AnalysisResponse;
}

export interface RevisionAnalysis {
	document: DesignDocument;
	detail: AnalysisDetail;
	/** The design as saved. */
	nominal: AnalysisResponse;
	/** The rail's corners (none without a rail), analysed on the nominal's grid. */
	corners: CornerAnalysis[];
	/** Corners the engine refused (e.g. duty out of range at Vin min), with the reason. */
	refused: { label: string; message: string }[];
}

export function analyzeRevision(design: unknown, rail: RailOperatingRange | null): RevisionAnalysis | ContractError {
	const detail = analyzeDesignDetailed(design, { includeResponse: true });
	if ('error' in detail) return detail;
	const d = detail.document;
	const nominal = detail.response;
	const corners: CornerAnalysis[] = [];
	const refused: RevisionAnalysis['refused'] = [];
	if (rail) {
		const built = nominal.compensator.rounded ?? nominal.compensator.ideal;
		const parts = Object.fromEntries(PART_KEYS.filter((k) => built.parts[k] !== undefined).map((k) => [k, built.parts[k]]));
		const f = nominal.response.freqHz;
		const sweep = f.length > 1 ? { freqHz: f } : undefined;
		for (const c of railCorners(rail)) {
			// With feed-forward the ramp follows Vin; `vramp` is the ramp at the design's vin.
			const vramp = d.modulator.feedForward ? (d.modulator.vramp * c.vin) / d.plant.vin : d.modulator.vramp;
			const doc = { ...d, plant: { ...d.plant, vin: c.vin, iout: c.iout }, modulator: { ...d.modulator, vramp }, compensator: { ...d.compensator, parts, series: null }, sweep };
			const r = analyzeDesign(doc);
			if ('error' in r) refused.push({ label: c.label, message: r.error.message });
			else corners.push({ label: c.label, vin: c.vin, iout: c.iout, response: r });
		}
	}
	return { document: d, detail, nominal, corners, refused };
}

/** Load step and reference step of the nominal loop (closed-loop model, delay as Padé). */
export function stepResponses(detail: AnalysisDetail) {
	try {
		// Two grid points: only the steps are used here, not the closed-loop traces.
		const section = analyzeClosedLoop(closedLoopInputOf(detail, detail.response.response.freqHz.slice(0, 2)));
		return {
			stable: section.stable,
			loadStep: section.loadStep,
			referenceStep: section.referenceStep,
			warnings: section.warnings.map((w) => w.message)
		};
	} catch (e) {
		return { stable: null, loadStep: null, referenceStep: null, warnings: [`No step response: ${e instanceof Error ? e.message : String(e)}`] };
	}
}

/**
 * Tolerances for the spread: the rail's inductor, capacitor and ESR tolerances, and for the
 * network 1 % resistors and 10 % capacitors [common practice: E96 resistors are 1 % parts;
 * 10 % is the usual X7R/C0G ceramic tolerance]. Uniform in ±tol; capped at ±90 %.
 */
export function spreadTolerances(t: RailTolerances): Partial<Record<PartName, PartTolerance>> {
	const u = (pct: number): PartTolerance => ({ tol: Math.min(0.9, pct / 100), dist: 'uniform' });
	return { l: u(t.inductorPct), c: u(t.capacitorPct), esr: u(t.esrPct), r1: u(1), r2: u(1), r3: u(1), c1: u(10), c2: u(10), c3: u(10) };
}

/** A small seeded Monte Carlo run (server-side, so kept short) and its yield against the targets. */
export function spreadSummary(detail: AnalysisDetail, tolerances: RailTolerances, targets: MarginTargets, samples = 200) {
	const tols = spreadTolerances(tolerances);
	try {
		const r = runSpread(loopSpecFromDetail(detail), {
			samples,
			seed: 1,
			tolerances: tols,
			targets: { phaseMarginDeg: targets.phaseMarginDeg, gainMarginDb: targets.gainMarginDb }
		});
		return {
			ok: true as const,
			samples: r.completed,
			seed: r.seed,
			failures: r.failures,
			unstable: r.unstable,
			yield: r.yield,
			stats: { crossoverHz: r.stats.crossoverHz, phaseMarginDeg: r.stats.phaseMarginDeg, gainMarginDb: r.stats.gainMarginDb },
			tolerancePct: Object.fromEntries(Object.entries(tols).map(([k, v]) => [k, v!.tol * 100]))
		};
	} catch (e) {
		return { ok: false as const, error: e instanceof Error ? e.message : String(e) };
	}
}

export interface ParameterChange {
	path: string;
	before: unknown;
	after: unknown;
}

/** Leaf-by-leaf differences between two design documents (dotted paths, arrays by index). */
export function parameterDiff(before: unknown, after: unknown): ParameterChange[] {
	const out: ParameterChange[] = [];
	const walk = (a: unknown, b: unknown, path: string) => {
		const isObj = (x: unknown): x is Record<string, unknown> => typeof x === 'object' && x !== null;
		if (isObj(a) && isObj(b) && Array.isArray(a) === Array.isArray(b)) {
			const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
			for (const k of keys) walk(a[k], b[k], path ? `${path}.${k}` : k);
			return;
		}
		if (JSON.stringify(a) !== JSON.stringify(b)) out.push({ path, before: a ?? null, after: b ?? null });
	};
	walk(before, after, '');
	return out;
}

export type Verdict = { status: 'pass' | 'caution' | 'fail'; reason: string };

/** One corner against the targets, with the board-health thresholds (5° / 3 dB short = caution). */
export function judge(m: { crossoverHz: number | null; phaseMarginDeg: number | null; gainMarginDb: number | null; closedLoopStable: boolean | null }, t: MarginTargets, fswHz: number): Verdict {
	if (m.closedLoopStable === false) return { status: 'fail', reason: 'closed loop unstable' };
	if (m.phaseMarginDeg === null || m.crossoverHz === null) return { status: 'fail', reason: 'no crossover found' };
	const reasons: string[] = [];
	let status: Verdict['status'] = 'pass';
	const worse = (s: Verdict['status']) => {
		if (s === 'fail' || (s === 'caution' && status === 'pass')) status = s;
	};
	if (m.phaseMarginDeg < t.phaseMarginDeg) {
		worse(m.phaseMarginDeg >= t.phaseMarginDeg - 5 ? 'caution' : 'fail');
		reasons.push(`PM ${m.phaseMarginDeg.toFixed(1)}° below the ${t.phaseMarginDeg}° target`);
	}
	if (m.gainMarginDb !== null && m.gainMarginDb < t.gainMarginDb) {
		worse(m.gainMarginDb >= t.gainMarginDb - 3 ? 'caution' : 'fail');
		reasons.push(`GM ${m.gainMarginDb.toFixed(1)} dB below the ${t.gainMarginDb} dB target`);
	}
	if (m.crossoverHz > fswHz / 2) {
		worse('fail');
		reasons.push('crossover above fsw/2, beyond the averaged model');
	} else if (m.crossoverHz > t.maxCrossoverFraction * fswHz) {
		worse('caution');
		reasons.push(`crossover above fsw × ${t.maxCrossoverFraction}`);
	}
	return { status, reason: reasons.length ? reasons.join('; ') : 'margins meet the targets' };
}
