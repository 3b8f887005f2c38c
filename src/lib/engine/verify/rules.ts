/**
 * The verdict rules (DEVELOPERS.md, "Verdict rules"), one place for every screen, export and stored verdict.
 * Thresholds [common practice]:
 * - PM below the target by up to 5°, GM by up to 3 dB, a crossover above maxCrossoverFraction·fsw,
 *   above a fifth of the RHP zero at any operating case (compensators/crossoverLimit.ts) or outside the
 *   crossoverHz range: caution.
 * - More short, any corner closed-loop unstable or not modelled, no crossover at a corner, or a
 *   crossover above fsw/2 (outside the averaged model): fail.
 * - Spread yield below 100 % at the targets: caution; below 90 %: fail.
 * - A warning that invalidates the averaged model at a corner (DCM, a load within 20 % of the CCM
 *   boundary, input-filter Middlebrook failure, op-amp bandwidth): at least a caution, corner named.
 * Worst values use the governing margins of each corner (analysis/margins.ts).
 */
import { formatDb, formatDeg, formatEng, formatPercent } from '../../units/format';
import type { Targets } from '../contract/targetsSchema';
import { RHP_ZERO_RULE_CODE } from '../compensators/crossoverLimit';
import type { VerdictRow, VerdictStatus, VerifiedCorner, Worst } from './types';

export const PM_CAUTION_DEG = 5;
export const GM_CAUTION_DB = 3;
export const YIELD_FAIL_BELOW = 0.9;
/** Warning codes that mean the averaged small-signal model does not hold at that corner. */
export const MODEL_WARNING_CODES = ['dcm-outside-model', 'dcm-operating-point', 'near-ccm-boundary', 'input-filter-middlebrook', 'opamp-gbw-too-low'] as const;

/** A corner the document says runs in DCM (diode emulation, diode): outside the model, its margins do not count. */
const inModel = (c: VerifiedCorner) => !c.warnings.includes('dcm-outside-model');

const RANK: Record<VerdictStatus, number> = { pass: 0, caution: 1, fail: 2 };
export const worseOf = (a: VerdictStatus, b: VerdictStatus): VerdictStatus => (RANK[b] > RANK[a] ? b : a);

export interface RuleInput {
	targets: Targets;
	/** The document's control method: peak current adds the current-loop row. */
	peakCurrent?: boolean;
	fswHz: number;
	corners: VerifiedCorner[];
	worst: { phaseMarginDeg: Worst | null; gainMarginDb: Worst | null; crossoverLowHz: Worst | null; crossoverHighHz: Worst | null };
	spread: { yield: number; samples: number } | null;
	warnings: { code: string; message: string; corners: string[] }[];
}

export function pmRow(t: Targets, corners: VerifiedCorner[], worst: Worst | null): VerdictRow {
	const target = `≥ ${formatDeg(t.phaseMarginDeg)}`;
	const none = corners.find((c) => inModel(c) && c.error === null && c.phaseMarginDeg === null);
	if (none) return { metric: 'pm', status: 'fail', value: null, target, corner: none.label, reason: `The loop gain never reaches 0 dB at ${none.label}: no crossover, no phase margin.` };
	if (!worst) return { metric: 'pm', status: 'fail', value: null, target, corner: null, reason: 'No corner could be analysed.' };
	const short = t.phaseMarginDeg - worst.value;
	const status: VerdictStatus = short <= 0 ? 'pass' : short <= PM_CAUTION_DEG ? 'caution' : 'fail';
	const verb = status === 'pass' ? 'meets' : 'is below';
	return { metric: 'pm', status, value: worst.value, target, corner: worst.corner, reason: `Worst PM ${formatDeg(worst.value)} at ${worst.corner} ${verb} the ${formatDeg(t.phaseMarginDeg)} target.` };
}

export function gmRow(t: Targets, worst: Worst | null): VerdictRow {
	const target = `≥ ${formatDb(t.gainMarginDb)}`;
	if (!worst) return { metric: 'gm', status: 'pass', value: null, target, corner: null, reason: 'The loop phase never reaches −180° at any corner: no gain margin limit.' };
	const short = t.gainMarginDb - worst.value;
	const status: VerdictStatus = short <= 0 ? 'pass' : short <= GM_CAUTION_DB ? 'caution' : 'fail';
	const verb = status === 'pass' ? 'meets' : 'is below';
	return { metric: 'gm', status, value: worst.value, target, corner: worst.corner, reason: `Worst GM ${formatDb(worst.value)} at ${worst.corner} ${verb} the ${formatDb(t.gainMarginDb)} target.` };
}

export function fcRow(t: Targets, fswHz: number, low: Worst | null, high: Worst | null, warnings: RuleInput['warnings'] = []): VerdictRow {
	const limit = t.maxCrossoverFraction * fswHz;
	const range = t.crossoverHz;
	const parts = [`≤ ${formatEng(limit, 'Hz')} (${formatPercent(t.maxCrossoverFraction)} of fsw)`];
	if (range?.min !== undefined) parts.push(`≥ ${formatEng(range.min, 'Hz')}`);
	if (range?.max !== undefined) parts.push(`≤ ${formatEng(range.max, 'Hz')}`);
	const target = parts.join(', ');
	if (!high || !low) return { metric: 'fc', status: 'fail', value: null, target, corner: null, reason: 'No corner has a crossover.' };
	const f = (x: number) => formatEng(x, 'Hz');
	if (high.value > fswHz / 2) {
		return { metric: 'fc', status: 'fail', value: high.value, target, corner: high.corner, reason: `Crossover ${f(high.value)} at ${high.corner} is above fsw/2 (${f(fswHz / 2)}), outside the averaged model.` };
	}
	const rhp = warnings.find((w) => w.code === RHP_ZERO_RULE_CODE);
	if (rhp) {
		const corner = rhp.corners[0] ?? null;
		const more = rhp.corners.length > 1 ? ` (and ${rhp.corners.length - 1} more corner${rhp.corners.length > 2 ? 's' : ''})` : '';
		return { metric: 'fc', status: 'caution', value: high.value, target, corner, reason: `At ${corner}${more}: ${rhp.message}` };
	}
	if (high.value > limit) {
		return { metric: 'fc', status: 'caution', value: high.value, target, corner: high.corner, reason: `Crossover ${f(high.value)} at ${high.corner} is above ${f(limit)} (${formatPercent(t.maxCrossoverFraction)} of fsw).` };
	}
	if (range?.max !== undefined && high.value > range.max) {
		return { metric: 'fc', status: 'caution', value: high.value, target, corner: high.corner, reason: `Crossover ${f(high.value)} at ${high.corner} is above the ${f(range.max)} allowed.` };
	}
	if (range?.min !== undefined && low.value < range.min) {
		return { metric: 'fc', status: 'caution', value: low.value, target, corner: low.corner, reason: `Crossover ${f(low.value)} at ${low.corner} is below the ${f(range.min)} required.` };
	}
	return { metric: 'fc', status: 'pass', value: high.value, target, corner: high.corner, reason: `Crossover from ${f(low.value)} (${low.corner}) to ${f(high.value)} (${high.corner}), within the targets.` };
}

export function stabilityRow(all: VerifiedCorner[]): VerdictRow {
	const target = 'stable at every corner';
	const corners = all.filter(inModel);
	const unstable = corners.filter((c) => c.closedLoopStable === false);
	const failed = corners.filter((c) => c.error !== null);
	const unknown = corners.filter((c) => c.error === null && c.closedLoopStable === null);
	if (unstable.length) {
		return { metric: 'stability', status: 'fail', value: unstable.length, target, corner: unstable[0].label, reason: `${unstable.length} of ${corners.length} corners have a closed-loop pole in the right half plane, first at ${unstable[0].label}.` };
	}
	if (failed.length) {
		return { metric: 'stability', status: 'fail', value: failed.length, target, corner: failed[0].label, reason: `${failed.length} of ${corners.length} corners cannot be modelled, first ${failed[0].label}: ${failed[0].error}` };
	}
	if (unknown.length) {
		return { metric: 'stability', status: 'caution', value: unknown.length, target, corner: unknown[0].label, reason: `The closed-loop poles could not be decided at ${unknown.length} corners, first ${unknown[0].label}.` };
	}
	return { metric: 'stability', status: 'pass', value: 0, target, corner: null, reason: `All ${corners.length} corners have their closed-loop poles in the left half plane.` };
}

export function yieldRow(spread: { yield: number; samples: number }): VerdictRow {
	const y = spread.yield;
	const status: VerdictStatus = y >= 1 ? 'pass' : y >= YIELD_FAIL_BELOW ? 'caution' : 'fail';
	return {
		metric: 'yield',
		status,
		value: y,
		target: `${formatPercent(1)} (fail below ${formatPercent(YIELD_FAIL_BELOW)})`,
		corner: null,
		reason: `${formatPercent(y)} of ${spread.samples} spread samples meet every target and are stable.`
	};
}

export function modelRow(warnings: RuleInput['warnings']): VerdictRow {
	const target = 'averaged CCM model valid at every corner';
	const hits = warnings.filter((w) => (MODEL_WARNING_CODES as readonly string[]).includes(w.code));
	if (!hits.length) return { metric: 'model', status: 'pass', value: 0, target, corner: null, reason: 'No corner leaves the averaged model (no DCM, CCM boundary, input-filter or op-amp warning).' };
	const first = hits[0];
	const more = first.corners.length > 1 ? ` and ${first.corners.length - 1} more corner${first.corners.length > 2 ? 's' : ''}` : '';
	return {
		metric: 'model',
		status: 'caution',
		value: hits.reduce((n, w) => n + w.corners.length, 0),
		target,
		corner: first.corners[0] ?? null,
		reason: `${first.message.replace(/\.$/, '')} (at ${first.corners[0]}${more})${hits.length > 1 ? `; also ${hits.slice(1).map((w) => w.code).join(', ')}` : ''}.`
	};
}

/**
 * Peak current mode only: subharmonic oscillation of the current loop at any corner fails (the
 * outer loop cannot cure it), a Qp above 2 is a caution (plants/currentMode.ts, docs/formulas.md
 * §14.2). The reason carries the warning's words, which name the ramp slope that cures it.
 */
export function currentLoopRow(warnings: RuleInput['warnings']): VerdictRow {
	const target = 'mc·D′ > 0.5 and Qp ≤ 2 at every corner';
	for (const [code, status] of [['subharmonic-unstable', 'fail'], ['subharmonic-peaking', 'caution']] as const) {
		const w = warnings.find((x) => x.code === code);
		if (!w) continue;
		const more = w.corners.length > 1 ? ` and ${w.corners.length - 1} more corner${w.corners.length > 2 ? 's' : ''}` : '';
		return { metric: 'current-loop', status, value: w.corners.length, target, corner: w.corners[0] ?? null, reason: `At ${w.corners[0]}${more}: ${w.message}` };
	}
	return { metric: 'current-loop', status: 'pass', value: 0, target, corner: null, reason: 'The current loop is damped at fsw/2 at every corner (Qp ≤ 2).' };
}

/** Every row, then the overall status (the worst row) and the sentence for the heading. */
export function verdictOf(input: RuleInput): { status: VerdictStatus; summary: string; rows: VerdictRow[] } {
	const t = input.targets;
	const rows: VerdictRow[] = [
		pmRow(t, input.corners, input.worst.phaseMarginDeg),
		gmRow(t, input.worst.gainMarginDb),
		fcRow(t, input.fswHz, input.worst.crossoverLowHz, input.worst.crossoverHighHz, input.warnings),
		stabilityRow(input.corners)
	];
	if (input.spread) rows.push(yieldRow(input.spread));
	if (input.peakCurrent) rows.push(currentLoopRow(input.warnings));
	rows.push(modelRow(input.warnings));
	const status = rows.reduce<VerdictStatus>((s, r) => worseOf(s, r.status), 'pass');
	const first = rows.find((r) => r.status === status);
	const summary = status === 'pass' ? `Meets every target at all ${input.corners.length} corners.` : first!.reason;
	return { status, summary, rows };
}
