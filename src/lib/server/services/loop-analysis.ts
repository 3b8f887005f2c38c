// What the review page, the exports and the report draw from one stored revision besides its
// stored verdict: the nominal analysis (Bode arrays, operating point, network), the loop traces
// at the corners the verdict names, the closed-loop step responses, and the differences to
// another revision (parameters and verdict). Nothing here decides a verdict: that is computed
// once at save (engine/verify) and read from the row.
import { analyzeDesignDetailed, type AnalysisDetail } from '../../engine/analyze';
import type { ContractError } from '../../engine/contract/errors';
import { analyzeClosedLoop } from '../../engine/closedloop/analyzeClosedLoop';
import { closedLoopInputOf } from '../../engine/closedloop/sections';
import { buildLoop, loopSpecFromDetail } from '../../engine/corners/loopModel';
import { applyVariation, type PartName } from '../../engine/corners/variation';
import { frequencyResponse } from '../../engine/tf/evaluate';
import type { Verification } from '../../engine/verify/types';

/** The design as saved, analysed for display only (no corner or spread sections: those are in the verdict). */
export function analyzeStored(design: unknown): AnalysisDetail | ContractError {
	return analyzeDesignDetailed(design, { includeResponse: true, sections: false });
}

export interface CornerTrace {
	/** "worst phase margin: Vin max, Iout min, L −20 %". */
	label: string;
	corner: string;
	magDb: number[];
	phaseDeg: number[];
}

/**
 * Loop traces, on the nominal's grid, of the corners that set the stored verdict's worst PM,
 * worst GM, lowest and highest crossover (each corner once). `verification` must carry its
 * corner list (a single revision's, not a list answer's).
 */
export function cornerTraces(detail: AnalysisDetail, verification: Verification | null): CornerTrace[] {
	if (!verification?.corners.list) return [];
	const w = verification.worst;
	const named: [string, { corner: string } | null][] = [
		['worst phase margin', w.phaseMarginDeg],
		['worst gain margin', w.gainMarginDb],
		['lowest crossover', w.crossoverLowHz],
		['highest crossover', w.crossoverHighHz]
	];
	const spec = loopSpecFromDetail(detail);
	const grid = Float64Array.from(detail.response.response.freqHz);
	const out: CornerTrace[] = [];
	for (const [why, pick] of named) {
		if (!pick) continue;
		const seen = out.find((t) => t.corner === pick.corner);
		if (seen) {
			seen.label = `${seen.label.slice(0, seen.label.indexOf(':'))}, ${why}: ${pick.corner}`;
			continue;
		}
		const c = verification.corners.list.find((x) => x.label === pick.corner);
		if (!c || c.error) continue;
		try {
			const r = frequencyResponse(buildLoop(applyVariation(spec, { vin: c.vin, iout: c.iout, factors: c.factors as Partial<Record<PartName, number>> })).loop, grid);
			out.push({ label: `${why}: ${pick.corner}`, corner: pick.corner, magDb: Array.from(r.magDb), phaseDeg: Array.from(r.phaseDeg) });
		} catch {
			// A corner the model refuses has no trace; the verdict already says why.
		}
	}
	return out;
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

export interface VerdictChange {
	/** "verdict", "pm", "gm", "fc", "yield", … */
	metric: string;
	before: { status: string | null; value: number | null; corner: string | null };
	after: { status: string | null; value: number | null; corner: string | null };
}

/** The part of a verdict a comparison reads (a stored verdict's headline carries it). */
type DiffedVerdict = Pick<Verification, 'status' | 'rows'>;

/** Row-by-row differences between two stored verdicts (status, worst value or its corner). */
export function verdictDiff(before: DiffedVerdict | null, after: DiffedVerdict | null): VerdictChange[] {
	const out: VerdictChange[] = [];
	const side = (v: DiffedVerdict | null, metric: string) => {
		if (!v) return { status: null, value: null, corner: null };
		if (metric === 'verdict') return { status: v.status, value: null, corner: null };
		const r = v.rows.find((x) => x.metric === metric);
		return r ? { status: r.status, value: r.value, corner: r.corner } : { status: null, value: null, corner: null };
	};
	const metrics = ['verdict', ...new Set([...(before?.rows ?? []), ...(after?.rows ?? [])].map((r) => r.metric))];
	for (const m of metrics) {
		const a = side(before, m);
		const b = side(after, m);
		if (a.status !== b.status || a.value !== b.value || a.corner !== b.corner) out.push({ metric: m, before: a, after: b });
	}
	return out;
}
