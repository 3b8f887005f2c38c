/**
 * Strict number reading for analyzer exports: plain decimal or scientific notation, optionally with a decimal
 * comma (only when the separator is not a comma). No thousands separators, no units, no "inf"/"nan".
 */

const DOT = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const COMMA = /^[+-]?(\d+,?\d*|,\d+)([eE][+-]?\d+)?$/;

/** The number in a cell, or null when the cell is not a finite number in an accepted form. */
export function readNumber(cell: string, decimalComma: boolean): number | null {
	const s = cell.trim();
	if (s === '') return null;
	let text: string;
	if (DOT.test(s)) text = s;
	else if (decimalComma && COMMA.test(s)) text = s.replace(',', '.');
	else return null;
	const x = Number(text);
	return Number.isFinite(x) ? x : null;
}

/** True when a cell holds a decimal comma ("1,5" or "1,5E3") and no dot: a hint for semicolon/tab files. */
export function looksLikeDecimalComma(cell: string): boolean {
	const s = cell.trim();
	return s.includes(',') && !s.includes('.') && COMMA.test(s);
}
