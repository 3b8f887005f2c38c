/**
 * The sweep of an analysis as CSV (papaparse unparse): one row per frequency with loop, plant and network
 * magnitude and phase. Header names carry the units, so the file reads back through the bench parser
 * (frequency first, then the loop gain and phase).
 */
import Papa from 'papaparse';
import type { AnalysisResponse } from '$lib/engine';

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
