/**
 * Types of bench data: a measured Bode response (loop gain or plant) read from an analyzer's CSV/TSV export.
 * Stored data are SI and canonical: frequency in Hz ascending, gain in dB, phase in degrees unwrapped.
 */

export type FrequencyUnit = 'Hz' | 'kHz' | 'MHz';
export type GainUnit = 'dB' | 'linear';
export type PhaseUnit = 'deg' | 'rad';
export type Separator = ',' | ';' | '\t';

/** A problem with the file; line and column are 1-based positions in the file, null when the problem has no place. */
export interface BenchIssue {
	line: number | null;
	column: number | null;
	/** The header text of that column, when known. */
	columnName?: string;
	message: string;
}

/** How the parser read the file, so the user can check it (and override what it guessed). */
export interface BenchFormat {
	separator: Separator;
	decimalComma: boolean;
	/** 1-based line of the header row. */
	headerLine: number;
	columns: {
		frequency: { index: number; name: string; unit: FrequencyUnit };
		gain: { index: number; name: string; unit: GainUnit };
		phase: { index: number; name: string; unit: PhaseUnit };
	};
	/** The file ran from high to low frequency and was reversed. */
	reversed: boolean;
	/** Largest phase jump (deg) removed by unwrapping; 0 when the file was already continuous. */
	unwrapJumps: number;
}

export interface BenchData {
	freqHz: number[];
	magDb: number[];
	/** Unwrapped along frequency; the first point lies in (−270°, 90°] (see unwrap.ts). */
	phaseDeg: number[];
	format: BenchFormat;
	/** Guesses and soft problems in plain words (e.g. a unit assumed because the header named none). */
	notes: string[];
}

export type BenchParseResult = { ok: true; data: BenchData } | { ok: false; errors: BenchIssue[] };

export interface BenchParseOptions {
	/** Largest accepted file, bytes (UTF-8). Default 5 MB. */
	maxBytes?: number;
	/** Most data rows accepted. Default 20 000. */
	maxRows?: number;
	/** Most errors reported before the parser stops listing them. Default 20. */
	maxErrors?: number;
	/** Override a unit the header states or omits. */
	units?: { frequency?: FrequencyUnit; gain?: GainUnit; phase?: PhaseUnit };
	/** Pick a column by its header text (case-insensitive) or its 1-based index instead of by name matching. */
	columns?: { frequency?: string | number; gain?: string | number; phase?: string | number };
	/**
	 * 'loop-gain' (default): the phase column is ∠T, PM = 180° + phase at the crossover.
	 * 'inverted': the analyzer includes the feedback sign and shows ∠(−T) (PM read directly); 180° is subtracted.
	 */
	phaseReference?: 'loop-gain' | 'inverted';
}

/** One gain crossover of the measured loop: |T| = 1. */
export interface MeasuredCrossover {
	freqHz: number;
	phaseMarginDeg: number;
}

/** One phase crossover: ∠T = −180° + k·360°. */
export interface MeasuredPhaseCrossover {
	freqHz: number;
	gainMarginDb: number;
}

export interface BenchMetrics {
	/** Governing crossing (smallest PM), null when the measured gain never crosses 0 dB. */
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	/** Smallest positive gain margin, null when there is none in the measured band. */
	gainMarginDb: number | null;
	phaseCrossoverHz: number | null;
	crossovers: MeasuredCrossover[];
	phaseCrossovers: MeasuredPhaseCrossover[];
	/** Why a figure is null, in plain words. */
	notes: string[];
}

/** Model value at one frequency: magnitude in dB and phase in degrees. */
export type ModelEvaluator = (freqHz: number) => { magDb: number; phaseDeg: number };

export interface DeviationStats {
	maxAbs: number;
	rms: number;
	/** Frequency of the largest absolute deviation, Hz. */
	atHz: number;
}

export interface BenchDeviation {
	/** Band actually compared (the measured points inside the requested band), Hz. */
	startHz: number;
	stopHz: number;
	points: number;
	/** Measured minus model, dB. */
	magDb: DeviationStats;
	/** Measured minus model, degrees, reduced to (−180°, 180°] so a whole-turn offset is not a deviation. */
	phaseDeg: DeviationStats;
	/** Per-point deviations in the band, for an overlay plot. */
	perPoint: { freqHz: number[]; magDb: number[]; phaseDeg: number[] };
}
