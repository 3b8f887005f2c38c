/**
 * Number formatting for exports: engineering notation with SI prefixes, 3 significant figures by default
 * (identity sheet: never more digits than the inputs justify), 4 for component values.
 */
import { format } from 'd3-format';

const eng3 = format('.3~s');
const eng4 = format('.4~s');

/** 45000 → "45 kHz", 4.7e-6 → "4.7 µH"; non-finite → "—". */
export function formatEng(value: number, unit: string, digits: 3 | 4 = 3): string {
	if (!Number.isFinite(value)) return '—';
	if (value === 0) return `0 ${unit}`.trim();
	const s = (digits === 4 ? eng4 : eng3)(value);
	const m = /^(-?[\d.]+)(\D*)$/.exec(s);
	if (!m) return `${s} ${unit}`.trim();
	return `${m[1]} ${m[2]}${unit}`.trim();
}

export const formatDb = (x: number | null | undefined) => (x == null || !Number.isFinite(x) ? '—' : `${x.toFixed(1)} dB`);
export const formatDeg = (x: number | null | undefined) => (x == null || !Number.isFinite(x) ? '—' : `${x.toFixed(1)}°`);
export const formatHz = (x: number | null | undefined) => (x == null ? '—' : formatEng(x, 'Hz'));
