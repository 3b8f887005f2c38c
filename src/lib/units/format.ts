/**
 * Engineering-notation display through d3-format: 3 significant figures by default, 4 for
 * component values, trailing zeros trimmed, µ (never u), a thin gap before prefix + unit
 * ("4.7 µH", "450 kHz"). Outside f…T the value falls back to an exponent ("1.2e+18 Hz").
 */
import { format as d3format } from 'd3-format';
import { DISPLAY_PREFIX } from './prefixes';
import type { UnitSymbol } from './quantities';

/** Significant figures for component values (R, C, L) versus everything else. */
export const COMPONENT_DIGITS = 4;
export const DEFAULT_DIGITS = 3;

const siFormatters = new Map<number, (v: number) => string>();
const expFormatters = new Map<number, (v: number) => string>();

function cached(map: Map<number, (v: number) => string>, spec: (d: number) => string, digits: number) {
	let f = map.get(digits);
	if (!f) map.set(digits, (f = d3format(spec(digits))));
	return f;
}

const KNOWN_PREFIXES = new Set(Object.values(DISPLAY_PREFIX).filter((p) => p !== ''));

export interface FormatOptions {
	/** Significant figures, 1…21. Default 3. */
	digits?: number;
	/** Separator between the number and prefix+unit. Default a plain space. */
	gap?: string;
	/** Text for a missing or non-finite value. Default an en dash. */
	missing?: string;
}

/** 4.7e-6, 'H' → "4.7 µH"; 0.022, 'Ω' → "22 mΩ"; non-finite → "–". */
export function formatEng(value: number | null | undefined, unit: UnitSymbol = '', options: FormatOptions = {}): string {
	const { digits = DEFAULT_DIGITS, gap = ' ', missing = '–' } = options;
	if (value === null || value === undefined || !Number.isFinite(value)) return missing;
	const text = cached(siFormatters, (d) => `.${d}~s`, digits)(value);
	const last = text.slice(-1);
	if (/\d/.test(last)) return unit ? `${text}${gap}${unit}` : text;
	if (KNOWN_PREFIXES.has(last)) return `${text.slice(0, -1)}${gap}${last}${unit}`;
	// d3 went beyond f…T (a, P, E …): an exponent reads better than a rare prefix.
	const exp = cached(expFormatters, (d) => `.${Math.max(0, d - 1)}~e`, digits)(value);
	return unit ? `${exp}${gap}${unit}` : exp;
}

/** A component value (R, C, L, ESR …) with 4 significant figures. */
export function formatPart(value: number | null | undefined, unit: UnitSymbol, options: FormatOptions = {}): string {
	return formatEng(value, unit, { digits: COMPONENT_DIGITS, ...options });
}

/** Plain text for an input box: no gap, so it can be typed back as is ("4.7µH"). */
export function formatForInput(value: number, unit: UnitSymbol = '', digits = COMPONENT_DIGITS): string {
	return formatEng(value, unit, { digits, gap: '' });
}

const fixed1 = d3format('.1f');

/** Degrees with one decimal ("54.6°"); null → "–". */
export function formatDeg(value: number | null | undefined, missing = '–'): string {
	return value === null || value === undefined || !Number.isFinite(value) ? missing : `${fixed1(value)}°`;
}

/** Decibels with one decimal ("21.0 dB"); null → "–". */
export function formatDb(value: number | null | undefined, missing = '–'): string {
	return value === null || value === undefined || !Number.isFinite(value) ? missing : `${fixed1(value)} dB`;
}

/** A ratio as a percentage ("25%" or "98.1%"). */
export function formatPercent(ratio: number | null | undefined, missing = '–'): string {
	if (ratio === null || ratio === undefined || !Number.isFinite(ratio)) return missing;
	const pct = ratio * 100;
	return `${Math.abs(pct) >= 10 ? fixed1(pct).replace(/\.0$/, '') : fixed1(pct)}%`;
}
