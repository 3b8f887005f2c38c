/**
 * What an exported Bode plot draws (the same elements as the design screen's plot): traces of loop, plant and
 * network, corners drawn thin and faint, measured bench points, the crossover and gain-margin chips, and the band
 * above fsw/2. Arrays follow `freqHz` (ascending, Hz); dB and degrees (unwrapped). Non-finite samples are gaps.
 */
import type { ControlMode } from '$lib/text/controlMode';

export type ExportTraceKind = 'loop' | 'plant' | 'compensator';

export interface ExportTrace {
	kind: ExportTraceKind;
	label: string;
	/** The nominal case is bold; corners are thin and faint. */
	nominal: boolean;
	magDb: ArrayLike<number>;
	phaseDeg: ArrayLike<number>;
}

/** Measured points (bench data), drawn as dots on their own frequencies. */
export interface ExportMeasured {
	label: string;
	freqHz: ArrayLike<number>;
	magDb: ArrayLike<number>;
	phaseDeg: ArrayLike<number>;
}

export interface ExportPlot {
	freqHz: ArrayLike<number>;
	traces: ExportTrace[];
	measured?: ExportMeasured[];
	crossover: { freqHz: number; phaseMarginDeg: number } | null;
	gainMargin: { freqHz: number; gainMarginDb: number } | null;
	/** fsw/2; above it the averaged model is not trusted (shaded). */
	modelLimitHz: number | null;
	title?: string;
	/** Control method: the plant is Gvd in voltage mode, Gvc (control voltage → vout) in peak current mode. */
	control?: ControlMode;
}
