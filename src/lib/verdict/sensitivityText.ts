// The words and numbers of one sensitivity row (engine/sensitivity), shared by the review page's
// table and the sign-off PDF: signed changes, the tolerance, the totals.
import type { MetricChanges, SensitivityReport, SensitivityRow } from '../engine/sensitivity';
import { formatDb, formatDeg, formatPercent } from '../units';

const signed = (text: string, v: number | null | undefined) => (v === null || v === undefined ? '–' : `${v > 0 ? '+' : ''}${text}`);
const pct = (v: number | null | undefined) => formatPercent(v === null || v === undefined ? null : v / 100);

export const SENSITIVITY_HEADER = ['Part', 'Tol.', 'PM per +10 %', 'PM at tol.', 'GM at tol.', 'fc at tol.'] as const;

export function sensitivityCells(r: SensitivityRow): string[] {
	const t = r.atTolerance;
	return [
		r.label,
		r.tolerance === null ? '–' : `±${formatPercent(r.tolerance)}`,
		signed(formatDeg(r.perTenPercent.phaseMarginDeg), r.perTenPercent.phaseMarginDeg),
		signed(formatDeg(t?.phaseMarginDeg), t?.phaseMarginDeg),
		signed(formatDb(t?.gainMarginDb), t?.gainMarginDb),
		signed(pct(t?.crossoverPct), t?.crossoverPct)
	];
}

/** The two total rows: all parts at their worst (linearised sum) and the root-sum-square. */
export function sensitivityTotals(report: SensitivityReport): { label: string; cells: string[] }[] {
	if (!report.totals) return [];
	const row = (label: string, m: MetricChanges, sign: string) => ({
		label,
		cells: [`${sign}${formatDeg(m.phaseMarginDeg)}`, `${sign}${formatDb(m.gainMarginDb)}`, `±${pct(m.crossoverPct)}`]
	});
	return [row('All at their worst (linearised)', report.totals.worst, '−'), row('Root-sum-square', report.totals.rss, '±')];
}

/** One sentence for people and screen readers: the part that moves PM most, at its tolerance and per +10 %. */
export function sensitivitySummary(report: SensitivityReport): string | null {
	const top = report.rows[0];
	if (!top || top.perTenPercent.phaseMarginDeg === null) return null;
	const tol = top.atTolerance?.phaseMarginDeg;
	const atTol = tol === null || tol === undefined ? '' : `${signed(formatDeg(tol), tol)} at its ±${formatPercent(top.tolerance)} tolerance, `;
	return `${top.label} moves the phase margin most: ${atTol}${signed(formatDeg(top.perTenPercent.phaseMarginDeg), top.perTenPercent.phaseMarginDeg)} per +10 %.`;
}
