/**
 * The verdict in words for people: one formatter for every screen, the PDF, the CSV and the API's
 * readers, so a stored verdict reads the same text everywhere (numbers via units/format.ts).
 */
import { formatDb, formatDeg, formatEng, formatPercent } from '../../units/format';
import type { VerdictRow, VerdictStatus } from './types';

export const VERDICT_LABELS: Record<VerdictRow['metric'], string> = {
	pm: 'Phase margin',
	gm: 'Gain margin',
	fc: 'Crossover',
	stability: 'Closed loop',
	yield: 'Spread yield',
	model: 'Model',
	'current-loop': 'Current loop'
};

export const STATUS_WORDS: Record<VerdictStatus, string> = { pass: 'Pass', caution: 'Caution', fail: 'Fail' };

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** The row's worst value as shown: "47.3°", "7.8 dB", "9.59 kHz", "stable", "98.5%", "valid". */
export function verdictValueText(row: VerdictRow): string {
	const v = row.value;
	switch (row.metric) {
		case 'pm':
			return v === null ? 'no crossover' : formatDeg(v);
		case 'gm':
			return v === null ? 'no −180° crossing' : formatDb(v);
		case 'fc':
			return v === null ? 'no crossover' : formatEng(v, 'Hz');
		case 'stability':
			return v === null || v === 0 ? 'stable' : `${plural(v, 'corner')} ${row.status === 'fail' ? 'failing' : 'undecided'}`;
		case 'yield':
			return formatPercent(v);
		case 'model':
			return v === null || v === 0 ? 'valid' : plural(v, 'warning');
		case 'current-loop':
			return v === null || v === 0 ? 'no subharmonic' : `${plural(v, 'corner')} ${row.status === 'fail' ? 'oscillating' : 'peaking'}`;
	}
}
