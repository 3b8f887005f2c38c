/**
 * Finds the frequency, gain and phase columns of a header row by their names, and the unit each name states.
 * Accepted forms (case-insensitive): "Frequency (Hz)", "Freq [kHz]", "f/Hz", "Gain (dB)", "Magnitude", "|T| (lin)",
 * "Phase (deg)", "Phase [rad]", "Phase (°)". A unit the header omits is left null for the caller to decide.
 */
import type { FrequencyUnit, GainUnit, PhaseUnit } from './types';

export interface HeaderCell {
	index: number;
	name: string;
}

export interface ColumnMatch<U> extends HeaderCell {
	unit: U | null;
}

export interface HeaderMatch {
	frequency: ColumnMatch<FrequencyUnit>;
	gain: ColumnMatch<GainUnit>;
	phase: ColumnMatch<PhaseUnit>;
	/** Other cells that also looked like a gain or phase column (the first one is used). */
	alternatives: string[];
}

/** Lower-case words of a header cell: "Gain [dB]" → ["gain", "db"]. Keeps |, ° and / as their own tokens. */
export function headerTokens(name: string): string[] {
	return name
		.toLowerCase()
		.replace(/°/g, ' deg ')
		.replace(/\|\s*(\w+)\s*\|/g, ' |$1| ')
		.replace(/[()[\]{}_:=,]/g, ' ')
		.replace(/\//g, ' / ')
		.split(/\s+/)
		.filter((t) => t.length > 0);
}

const FREQ_WORDS = new Set(['f', 'freq', 'frequency', 'frequenz', 'fréquence', 'frecuencia']);
const GAIN_WORDS = new Set(['gain', 'mag', 'magnitude', 'amplitude', 'ampl', '|t|', 'loop', 'modulus', 'abs', 'db']);
const PHASE_WORDS = new Set(['phase', 'ph', 'phi', 'arg', 'angle', 'phase°']);

export function frequencyUnitOf(tokens: string[]): FrequencyUnit | null {
	if (tokens.includes('mhz')) return 'MHz';
	if (tokens.includes('khz')) return 'kHz';
	if (tokens.includes('hz')) return 'Hz';
	return null;
}

export function gainUnitOf(tokens: string[]): GainUnit | null {
	if (tokens.some((t) => t === 'db' || t === 'dbv' || t.endsWith('db'))) return 'dB';
	if (tokens.some((t) => ['lin', 'linear', 'ratio', 'v/v', 'abs'].includes(t))) return 'linear';
	if (tokens.join('') === '|t|' || tokens.includes('|t|')) return 'linear';
	if (tokens.includes('v') && tokens.includes('/')) return 'linear';
	return null;
}

export function phaseUnitOf(tokens: string[]): PhaseUnit | null {
	if (tokens.some((t) => t === 'deg' || t === 'degree' || t === 'degrees' || t === 'phase°')) return 'deg';
	if (tokens.some((t) => t === 'rad' || t === 'radian' || t === 'radians')) return 'rad';
	return null;
}

function isFrequency(tokens: string[]): boolean {
	if (tokens.length === 0) return false;
	if (FREQ_WORDS.has(tokens[0])) return true;
	// "Hz" alone, or "kHz" alone, is a frequency column too.
	return tokens.length === 1 && frequencyUnitOf(tokens) !== null;
}

function isPhase(tokens: string[]): boolean {
	return tokens.some((t) => PHASE_WORDS.has(t));
}

function isGain(tokens: string[]): boolean {
	if (isPhase(tokens) || isFrequency(tokens)) return false;
	return tokens.some((t) => GAIN_WORDS.has(t)) || gainUnitOf(tokens) === 'dB';
}

/** Columns picked by the caller: header text (case-insensitive) or 1-based index. */
export interface ColumnChoice {
	frequency?: string | number;
	gain?: string | number;
	phase?: string | number;
}

function pick(cells: HeaderCell[], choice: string | number | undefined): HeaderCell | null | undefined {
	if (choice === undefined) return undefined;
	if (typeof choice === 'number') return cells.find((c) => c.index === choice - 1) ?? null;
	const want = choice.trim().toLowerCase();
	return cells.find((c) => c.name.trim().toLowerCase() === want) ?? null;
}

/**
 * Match a header row. Returns null when it does not name all three columns (so it is not the header).
 * Throws nothing; a caller-chosen column that does not exist makes the row not match.
 */
export function matchHeader(names: string[], choice: ColumnChoice = {}): HeaderMatch | null {
	const cells: HeaderCell[] = names.map((name, index) => ({ index, name: name.trim() }));
	const tokens = new Map(cells.map((c) => [c.index, headerTokens(c.name)]));
	const tok = (c: HeaderCell) => tokens.get(c.index) ?? [];

	const chosen = (key: keyof ColumnChoice, test: (t: string[]) => boolean, used: Set<number>) => {
		const p = pick(cells, choice[key]);
		if (p === null) return { cell: null, others: [] as HeaderCell[] };
		if (p !== undefined) return { cell: p, others: [] as HeaderCell[] };
		const all = cells.filter((c) => !used.has(c.index) && test(tok(c)));
		return { cell: all[0] ?? null, others: all.slice(1) };
	};

	const used = new Set<number>();
	const f = chosen('frequency', isFrequency, used);
	if (!f.cell) return null;
	used.add(f.cell.index);
	const p = chosen('phase', isPhase, used);
	if (!p.cell) return null;
	used.add(p.cell.index);
	const g = chosen('gain', isGain, used);
	if (!g.cell) return null;

	return {
		frequency: { ...f.cell, unit: frequencyUnitOf(tok(f.cell)) },
		gain: { ...g.cell, unit: gainUnitOf(tok(g.cell)) },
		phase: { ...p.cell, unit: phaseUnitOf(tok(p.cell)) },
		alternatives: [...g.others, ...p.others].map((c) => c.name)
	};
}
