/**
 * Reads a measured Bode response (loop gain or plant) exported by a frequency response analyzer as CSV or TSV.
 * Finds the header row and separator itself (tab, semicolon, comma; decimal comma allowed unless the separator is a
 * comma), the columns by name, converts to Hz / dB / degrees, sorts ascending and unwraps the phase.
 * Every rejected cell is reported with its 1-based line and column. Pure: no I/O, runs in the browser and the server.
 */
import Papa from 'papaparse';
import { matchHeader, type HeaderMatch } from './columns';
import { looksLikeDecimalComma, readNumber } from './numbers';
import type {
	BenchData,
	BenchFormat,
	BenchIssue,
	BenchParseOptions,
	BenchParseResult,
	FrequencyUnit,
	GainUnit,
	PhaseUnit,
	Separator
} from './types';
import { unwrapPhaseDeg } from './unwrap';

export const BENCH_MAX_BYTES = 5 * 1024 * 1024;
export const BENCH_MAX_ROWS = 20_000;
/** Lines searched for the header row (analyzers write a preamble of settings before it). */
export const HEADER_SEARCH_LINES = 200;

const SEPARATORS: Separator[] = ['\t', ';', ','];
const FREQ_SCALE: Record<FrequencyUnit, number> = { Hz: 1, kHz: 1e3, MHz: 1e6 };
const COMMENT = /^\s*(#|!|%|\/\/|\*)/;

/** Parse the text of a bench file. Never throws on bad content: problems come back as line-numbered errors. */
export function parseBenchFile(text: string, options: BenchParseOptions = {}): BenchParseResult {
	const maxBytes = options.maxBytes ?? BENCH_MAX_BYTES;
	const maxRows = options.maxRows ?? BENCH_MAX_ROWS;
	const maxErrors = options.maxErrors ?? 20;

	const bytes = utf8Length(text, maxBytes);
	if (bytes > maxBytes) {
		return fail([{ line: null, column: null, message: `file is larger than ${formatBytes(maxBytes)} (the upload limit)` }]);
	}
	const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
	const header = findHeader(lines, options);
	if (!header) {
		return fail([
			{
				line: null,
				column: null,
				message: `no header row naming a frequency, a gain (or magnitude) and a phase column in the first ${HEADER_SEARCH_LINES} lines`
			}
		]);
	}
	const { match, separator, lineIndex } = header;
	const cols = [match.frequency, match.gain, match.phase];
	const needCells = Math.max(...cols.map((c) => c.index)) + 1;

	const errors: BenchIssue[] = [];
	let dropped = 0;
	const report = (issue: BenchIssue) => {
		if (errors.length < maxErrors) errors.push(issue);
		else dropped++;
	};

	// Read the data rows: raw cells first, numbers after the decimal-comma decision.
	const rows: { line: number; cells: string[] }[] = [];
	for (let i = lineIndex + 1; i < lines.length; i++) {
		const raw = lines[i];
		if (raw.trim() === '' || COMMENT.test(raw)) continue;
		const cells = splitLine(raw, separator);
		if (cells.every((c) => c.trim() === '')) continue;
		if (rows.length >= maxRows) {
			report({ line: i + 1, column: null, message: `more than ${maxRows} data rows (the limit); thin the sweep or split the file` });
			break;
		}
		rows.push({ line: i + 1, cells });
	}
	const decimalComma =
		separator !== ',' && rows.some((r) => cols.some((c) => looksLikeDecimalComma(r.cells[c.index] ?? '')));

	const units = resolveUnits(match, options);
	const freq: number[] = [];
	const gain: number[] = [];
	const phase: number[] = [];
	const lineOf: number[] = [];
	for (const { line, cells } of rows) {
		const values: (number | null)[] = cols.map((c) => {
			const cell = cells[c.index];
			const column = c.index + 1;
			if (cell === undefined || cell.trim() === '') {
				const why = cells.length < needCells ? ` (the row has ${cells.length} cells, the header ${needCells} or more)` : '';
				report({ line, column, columnName: c.name, message: `missing value${why}` });
				return null;
			}
			const x = separator !== ',' ? readNumber(cell, true) : readNumber(cell, false);
			if (x === null) {
				report({ line, column, columnName: c.name, message: `"${clip(cell.trim())}" is not a number` });
			}
			return x;
		});
		const [f, g, p] = values;
		if (f !== null && f <= 0) {
			report({
				line,
				column: match.frequency.index + 1,
				columnName: match.frequency.name,
				message: f < 0 ? `negative frequency ${f}` : 'frequency 0 cannot sit on a log axis; it must be > 0'
			});
		}
		if (g !== null && units.gain === 'linear' && g <= 0) {
			report({ line, column: match.gain.index + 1, columnName: match.gain.name, message: `linear gain ${g} must be > 0 to have a dB value` });
		}
		if (f === null || g === null || p === null || f <= 0 || (units.gain === 'linear' && g <= 0)) continue;
		freq.push(f * FREQ_SCALE[units.frequency]);
		gain.push(units.gain === 'linear' ? 20 * Math.log10(g) : g);
		phase.push(units.phase === 'rad' ? (p * 180) / Math.PI : p);
		lineOf.push(line);
	}

	const reversed = checkOrder(freq, lineOf, match, report);
	if (errors.length === 0 && freq.length < 2) {
		report({ line: null, column: null, message: `only ${freq.length} data row${freq.length === 1 ? '' : 's'}; a response needs at least 2` });
	}
	if (errors.length > 0) {
		if (dropped > 0) errors.push({ line: null, column: null, message: `… and ${dropped} more problem${dropped === 1 ? '' : 's'}` });
		return fail(errors);
	}

	if (reversed) {
		freq.reverse();
		gain.reverse();
		phase.reverse();
	}
	if (options.phaseReference === 'inverted') for (let i = 0; i < phase.length; i++) phase[i] -= 180;
	const unwrapped = unwrapPhaseDeg(phase);
	const notes = [...units.notes];
	if (match.alternatives.length > 0) {
		notes.push(`several gain/phase columns; used "${match.gain.name}" and "${match.phase.name}", not ${match.alternatives.map((a) => `"${a}"`).join(', ')}`);
	}
	if (reversed) notes.push('the sweep ran from high to low frequency; it was reversed');

	const format: BenchFormat = {
		separator,
		decimalComma,
		headerLine: lineIndex + 1,
		columns: {
			frequency: { index: match.frequency.index + 1, name: match.frequency.name, unit: units.frequency },
			gain: { index: match.gain.index + 1, name: match.gain.name, unit: units.gain },
			phase: { index: match.phase.index + 1, name: match.phase.name, unit: units.phase }
		},
		reversed,
		unwrapJumps: unwrapped.largestJumpDeg
	};
	const data: BenchData = { freqHz: freq, magDb: gain, phaseDeg: unwrapped.phaseDeg, format, notes };
	return { ok: true, data };
}

function fail(errors: BenchIssue[]): BenchParseResult {
	return { ok: false, errors };
}

/** One line split by the separator, honouring double quotes. */
function splitLine(line: string, separator: Separator): string[] {
	const parsed = Papa.parse<string[]>(line, { delimiter: separator, header: false, dynamicTyping: false });
	return parsed.data[0] ?? [];
}

interface HeaderFound {
	match: HeaderMatch;
	separator: Separator;
	lineIndex: number;
}

/**
 * The first line (within HEADER_SEARCH_LINES) that names all three columns under some separator. When several
 * separators name them, the one whose next data line has enough numeric cells wins; ties go tab, semicolon, comma.
 */
function findHeader(lines: string[], options: BenchParseOptions): HeaderFound | null {
	const limit = Math.min(lines.length, HEADER_SEARCH_LINES);
	for (let i = 0; i < limit; i++) {
		const line = lines[i];
		if (line.trim() === '') continue;
		const found: HeaderFound[] = [];
		for (const separator of SEPARATORS) {
			if (!line.includes(separator)) continue;
			const match = matchHeader(splitLine(line, separator), options.columns);
			if (match) found.push({ match, separator, lineIndex: i });
		}
		if (found.length === 0) continue;
		const next = lines.slice(i + 1).find((l) => l.trim() !== '' && !COMMENT.test(l));
		const fits = (h: HeaderFound) => {
			if (next === undefined) return false;
			const cells = splitLine(next, h.separator);
			const c = h.match.frequency.index;
			return readNumber(cells[c] ?? '', h.separator !== ',') !== null && cells.length > Math.max(h.match.gain.index, h.match.phase.index);
		};
		return found.find(fits) ?? found[0];
	}
	return null;
}

interface Units {
	frequency: FrequencyUnit;
	gain: GainUnit;
	phase: PhaseUnit;
	notes: string[];
}

function resolveUnits(match: HeaderMatch, options: BenchParseOptions): Units {
	const notes: string[] = [];
	const frequency = options.units?.frequency ?? match.frequency.unit ?? assumed('Hz', `"${match.frequency.name}" names no unit; read as Hz`, notes);
	const gain = options.units?.gain ?? match.gain.unit ?? assumed('dB', `"${match.gain.name}" names no unit; read as dB`, notes);
	const phase = options.units?.phase ?? match.phase.unit ?? assumed('deg', `"${match.phase.name}" names no unit; read as degrees`, notes);
	return { frequency, gain, phase, notes };
}

function assumed<T>(value: T, note: string, notes: string[]): T {
	notes.push(note);
	return value;
}

/**
 * Frequencies must run strictly one way (ascending, or descending for a downward sweep). Reports duplicates and
 * out-of-order rows with their lines; returns true when the sweep is descending.
 */
function checkOrder(freq: number[], lineOf: number[], match: HeaderMatch, report: (i: BenchIssue) => void): boolean {
	if (freq.length < 2) return false;
	const descending = freq[1] < freq[0];
	const column = match.frequency.index + 1;
	const columnName = match.frequency.name;
	for (let i = 1; i < freq.length; i++) {
		const prev = freq[i - 1];
		const cur = freq[i];
		if (cur === prev) {
			report({ line: lineOf[i], column, columnName, message: `duplicate frequency ${cur} Hz (also on line ${lineOf[i - 1]})` });
		} else if (descending ? cur > prev : cur < prev) {
			report({
				line: lineOf[i],
				column,
				columnName,
				message: `frequency ${cur} Hz breaks the ${descending ? 'descending' : 'ascending'} order (line ${lineOf[i - 1]} has ${prev} Hz); rows must be sorted by frequency`
			});
		}
	}
	return descending;
}

/** UTF-8 length of a string, counted only as far as needed to know whether it exceeds `limit`. */
function utf8Length(text: string, limit: number): number {
	if (text.length > limit) return text.length; // at least one byte per UTF-16 unit
	let bytes = 0;
	for (let i = 0; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if (c < 0x80) bytes += 1;
		else if (c < 0x800) bytes += 2;
		else if (c >= 0xd800 && c <= 0xdbff) {
			bytes += 4;
			i++;
		} else bytes += 3;
	}
	return bytes;
}

function formatBytes(n: number): string {
	return n >= 1024 * 1024 ? `${+(n / (1024 * 1024)).toFixed(1)} MB` : `${Math.round(n / 1024)} kB`;
}

const clip = (s: string) => (s.length > 24 ? `${s.slice(0, 24)}…` : s);
