/**
 * Data the Bode plot draws. The plot only draws: callers compute every number (engine) and
 * hand it over here. Arrays are in the order of `freqHz` (ascending, Hz); magnitudes in dB,
 * phases in degrees (unwrapped). Non-finite samples are skipped, never drawn.
 */

import type { ControlMode } from '$lib/text/controlMode';

export type TraceKind = 'plant' | 'compensator' | 'loop';

export interface BodeTrace {
	id: string;
	kind: TraceKind;
	/** "Loop", "Vin max, Iout min" … shown in the hover readout. */
	label: string;
	/** The nominal case is drawn bold; corners thin and faint. */
	nominal: boolean;
	/** Optional stroke dash overriding the kind's, to tell an overlaid revision apart. */
	dash?: string;
	magDb: ArrayLike<number>;
	phaseDeg: ArrayLike<number>;
}

export interface PlotRoot {
	id: string;
	type: 'pole' | 'zero';
	freqHz: number;
	/** 2 for a double zero/pole drawn as one marker. */
	multiplicity: number;
	/** Only compensator corners the user may move are draggable. */
	draggable: boolean;
	/** "fz1", "fp2" … for the accessible name and the lane label. */
	label: string;
}

export interface BodeData {
	freqHz: ArrayLike<number>;
	traces: BodeTrace[];
	/** The governing gain crossover of the nominal loop. */
	crossover: { freqHz: number; phaseMarginDeg: number } | null;
	/** The nominal loop's gain margin point (phase at −180°). */
	gainMargin: { freqHz: number; gainMarginDb: number } | null;
	/** fsw/2: above it the averaged model is not trusted; shaded. */
	modelLimitHz: number | null;
	roots: PlotRoot[];
	/** Critical frequencies of the plant and the spec, drawn as labelled vertical marks (optional). */
	markers?: FreqMarker[];
	/** Measured bench data, drawn as dots on their own frequencies (optional). */
	measured?: MeasuredSeries[];
	/** Control method of the loop: names the plant trace Gvd (voltage mode) or Gvc (peak current mode). */
	control?: ControlMode;
}

/** A labelled frequency: the LC resonance, an ESR zero, the RHP zero, fsw/2, the crossover target. */
export interface FreqMarker {
	id: 'f0' | 'esr' | 'rhp' | 'half-fsw' | 'fc-target';
	/** Short label drawn on the plot ("RHP zero"). */
	label: string;
	freqHz: number;
}

/** One measured Bode file: Hz ascending, dB, unwrapped degrees. */
export interface MeasuredSeries {
	label: string;
	freqHz: ArrayLike<number>;
	magDb: ArrayLike<number>;
	phaseDeg: ArrayLike<number>;
}

export type TraceVisibility = Record<TraceKind, boolean>;

/** One line of the hover readout. */
export interface ReadoutRow {
	kind: TraceKind;
	magDb: number | null;
	phaseDeg: number | null;
	/** Across the corners: [min, max]; null when the kind has no corners shown. */
	magSpread: [number, number] | null;
	phaseSpread: [number, number] | null;
}
