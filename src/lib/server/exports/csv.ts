/**
 * The sweep of an analysis as CSV (papaparse unparse): one row per frequency with loop, plant and network
 * magnitude and phase. Header names carry the units, so the file reads back through the bench parser
 * (frequency first, then the loop gain and phase).
 */
import Papa from 'papaparse';
import type { AnalysisResponse } from '$lib/engine';
import type { Verification } from '$lib/engine/verify/types';

export const SWEEP_CSV_COLUMNS = [
	'Frequency (Hz)',
	'Loop gain (dB)',
	'Loop phase (deg)',
	'Plant gain (dB)',
	'Plant phase (deg)',
	'Network gain (dB)',
	'Network phase (deg)'
] as const;

export function sweepCsv(response: AnalysisResponse): string {
	const r = response.response;
	const rows = r.freqHz.map((f, i) => [
		f,
		r.loop.magDb[i],
		r.loop.phaseDeg[i],
		r.plant.magDb[i],
		r.plant.phaseDeg[i],
		r.compensator.magDb[i],
		r.compensator.phaseDeg[i]
	].map((v) => (v === undefined ? '' : num(v))));
	return Papa.unparse({ fields: [...SWEEP_CSV_COLUMNS], data: rows }, { newline: '\r\n' }) + '\r\n';
}

/** Up to 10 significant digits, plain decimal or exponent form. */
const num = (v: number) => (Number.isFinite(v) ? String(Number(v.toPrecision(10))) : '');

/**
 * The stored verdict as CSV: one row per verdict check (status, worst value, target, corner,
 * reason), a blank line, then one row per corner with its operating point, part factors and
 * margins. Values in SI, 10 significant digits.
 */
export function verdictCsv(v: Verification): string {
	const rows = Papa.unparse(
		{
			fields: ['Check', 'Status', 'Worst value', 'Target', 'Corner', 'Reason'],
			data: [['verdict', v.status, '', '', '', v.summary], ...v.rows.map((r) => [r.metric, r.status, r.value === null ? '' : num(r.value), r.target, r.corner ?? '', r.reason])]
		},
		{ newline: '\r\n' }
	);
	const corners = Papa.unparse(
		{
			fields: ['Corner', 'Vin (V)', 'Iout (A)', 'Part factors', 'Crossover (Hz)', 'Phase margin (deg)', 'Gain margin (dB)', 'Closed loop stable', 'Warnings', 'Error'],
			data: (v.corners.list ?? []).map((c) => [
				c.label,
				num(c.vin),
				num(c.iout),
				Object.entries(c.factors).map(([k, f]) => `${k}=${num(f)}`).join(' '),
				c.crossoverHz === null ? '' : num(c.crossoverHz),
				c.phaseMarginDeg === null ? '' : num(c.phaseMarginDeg),
				c.gainMarginDb === null ? '' : num(c.gainMarginDb),
				c.closedLoopStable === null ? '' : String(c.closedLoopStable),
				c.warnings.join(' '),
				c.error ?? ''
			])
		},
		{ newline: '\r\n' }
	);
	return `${rows}\r\n\r\n${corners}\r\n`;
}
