/**
 * Which part moves the margins most (docs/formulas.md §12): for every part the loop has (and the
 * loop delay when it is not 0), the derivative of the governing PM, GM and crossover with respect
 * to ln(value), by central differences, stated per +10 % of the part (ΔPM ≈ dPM/d ln x · ln 1.1)
 * and at the document's tolerance (dPM/d ln x · ln(1 + tol), the linearised change at the
 * tolerance limit). Ranked by the tolerance-weighted PM change, else by PM per +10 %. The sum of
 * |tolerance-weighted changes| is the linearised worst case that the corner analysis
 * (corners/corners.ts) computes exactly; the root-sum-square is the statistical one.
 */
import { loopMetrics } from '../analysis/margins';
import { isDesignInputError } from '../errors';
import { buildLoop, type LoopSpec } from '../corners/loopModel';
import { applyVariation, partLabel, partsPresent, type PartName } from '../corners/variation';

/** Parts (corners/variation.ts: in peak current mode Ri and Se in place of the ramp) and the loop delay. */
export type SensitivityParameter = PartName | 'delay';

export interface MetricChanges {
	/** Degrees of phase margin. */
	phaseMarginDeg: number | null;
	/** dB of gain margin. */
	gainMarginDb: number | null;
	/** Per cent of crossover frequency. */
	crossoverPct: number | null;
}

export interface SensitivityRow {
	parameter: SensitivityParameter;
	label: string;
	/** Change of each figure for a +10 % change of the part (linearised). */
	perTenPercent: MetricChanges;
	/** The document's tolerance (fraction) for the part, null when it states none. */
	tolerance: number | null;
	/** Change of each figure with the part at +tol (linearised); null without a tolerance. */
	atTolerance: MetricChanges | null;
}

export interface SensitivityReport {
	nominal: { phaseMarginDeg: number | null; gainMarginDb: number | null; crossoverHz: number | null };
	/** Largest first. */
	rows: SensitivityRow[];
	rankedBy: 'tolerance' | 'per-ten-percent';
	/** Over the rows with a tolerance: Σ|change| (linearised worst case) and √Σchange² per figure. */
	totals: { worst: MetricChanges; rss: MetricChanges } | null;
	/** Why a figure has no sensitivity (e.g. no phase crossover: no gain margin). */
	notes: string[];
}

const LN_TEN_PERCENT = Math.log(1.1);
/** Central-difference step in ln(value): small against any tolerance, large against rounding in the margins. */
export const SENSITIVITY_STEP = 1e-3;

type Figures = { pm: number | null; gm: number | null; fc: number | null };

function figuresOf(spec: LoopSpec): Figures | null {
	try {
		const m = loopMetrics(buildLoop(spec).loop, spec.rangeHz, { skipClosedLoop: true });
		return { pm: m.phaseMarginDeg, gm: m.gainMarginDb, fc: m.crossoverHz };
	} catch (e) {
		if (!isDesignInputError(e) && !(e instanceof RangeError)) throw e;
		return null;
	}
}

/** The spec with one parameter multiplied by `factor`. */
export function scaledSpec(spec: LoopSpec, parameter: SensitivityParameter, factor: number): LoopSpec {
	if (parameter === 'delay') return { ...spec, modulator: { ...spec.modulator, delayS: spec.modulator.delayS * factor } };
	return applyVariation(spec, { factors: { [parameter]: factor } });
}

export function sensitivityParameters(spec: LoopSpec): SensitivityParameter[] {
	const out: SensitivityParameter[] = partsPresent(spec);
	if (spec.modulator.delayS > 0) out.push('delay');
	return out;
}

export function sensitivity(spec: LoopSpec, tolerances: Partial<Record<SensitivityParameter, number>> = {}): SensitivityReport {
	const base = figuresOf(spec);
	const nominal = { phaseMarginDeg: base?.pm ?? null, gainMarginDb: base?.gm ?? null, crossoverHz: base?.fc ?? null };
	const notes: string[] = [];
	if (base && base.gm === null) notes.push('no phase crossover in the analysed range: no gain-margin sensitivity');
	if (base && base.fc === null) notes.push('no gain crossover: no phase-margin or crossover sensitivity');
	const rows: SensitivityRow[] = [];
	const h = SENSITIVITY_STEP;
	for (const parameter of sensitivityParameters(spec)) {
		const up = figuresOf(scaledSpec(spec, parameter, Math.exp(h)));
		const down = figuresOf(scaledSpec(spec, parameter, Math.exp(-h)));
		const slope = (a: number | null | undefined, b: number | null | undefined) => (a == null || b == null ? null : (a - b) / (2 * h));
		// fc in per cent: d ln fc / d ln x · 100.
		const dPm = slope(up?.pm, down?.pm);
		const dGm = slope(up?.gm, down?.gm);
		const dFc = up?.fc && down?.fc ? (100 * (Math.log(up.fc) - Math.log(down.fc))) / (2 * h) : null;
		const scale = (k: number): MetricChanges => ({
			phaseMarginDeg: dPm === null ? null : dPm * k,
			gainMarginDb: dGm === null ? null : dGm * k,
			crossoverPct: dFc === null ? null : dFc * k
		});
		const tol = (tolerances as Partial<Record<SensitivityParameter, number>>)[parameter];
		rows.push({
			parameter,
			label: partLabel(parameter),
			perTenPercent: scale(LN_TEN_PERCENT),
			tolerance: tol ?? null,
			atTolerance: tol ? scale(Math.log(1 + tol)) : null
		});
	}
	const anyTol = rows.some((r) => r.atTolerance);
	const key = (r: SensitivityRow) => Math.abs((anyTol ? r.atTolerance?.phaseMarginDeg : r.perTenPercent.phaseMarginDeg) ?? 0);
	rows.sort((a, b) => key(b) - key(a));
	let totals: SensitivityReport['totals'] = null;
	if (anyTol) {
		const sum = (pick: (c: MetricChanges) => number | null, f: (x: number) => number) => {
			let s = 0;
			let any = false;
			for (const r of rows) {
				const v = r.atTolerance ? pick(r.atTolerance) : null;
				if (v === null) continue;
				s += f(v);
				any = true;
			}
			return any ? s : null;
		};
		const both = (f: (x: number) => number, post: (x: number | null) => number | null): MetricChanges => ({
			phaseMarginDeg: post(sum((c) => c.phaseMarginDeg, f)),
			gainMarginDb: post(sum((c) => c.gainMarginDb, f)),
			crossoverPct: post(sum((c) => c.crossoverPct, f))
		});
		totals = { worst: both(Math.abs, (x) => x), rss: both((x) => x * x, (x) => (x === null ? null : Math.sqrt(x))) };
	}
	return { nominal, rows, rankedBy: anyTol ? 'tolerance' : 'per-ten-percent', totals, notes };
}
