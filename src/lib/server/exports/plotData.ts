/**
 * Builds the exported plot's data from an analysis response: the nominal loop, plant and network, optional corner
 * responses (drawn thin; they must share the nominal's frequency grid), measured bench data as dots, the governing
 * crossover and gain margin, and the network's finite poles and zeros for the lane.
 */
import type { AnalysisResponse } from '$lib/engine';
import type { BodeSvgOptions } from './bodeSvg';
import type { ExportMeasured, ExportPlot, ExportTrace } from './plotTypes';
import { plantTraceLabel, type ControlMode } from '$lib/text/controlMode';

export interface PlotFromResponseOptions {
	/** Switching frequency, Hz: the band above fsw/2 is hatched. */
	fswHz?: number;
	/** Corner cases (Vin × load …) analysed on the same sweep. */
	corners?: { label: string; response: AnalysisResponse }[];
	/** Loop gain alone at corners (the ones that set a verdict), on the same sweep. */
	cornerLoops?: { label: string; magDb: ArrayLike<number>; phaseDeg: ArrayLike<number> }[];
	measured?: ExportMeasured[];
	/** Which traces to draw [all three]. */
	show?: { loop?: boolean; plant?: boolean; compensator?: boolean };
	title?: string;
}

export function plotFromResponse(response: AnalysisResponse, options: PlotFromResponseOptions = {}): ExportPlot {
	const show = { loop: true, plant: true, compensator: true, ...options.show };
	const r = response.response;
	// Only a peak current-mode analysis reports the current loop's features.
	const control: ControlMode = response.features.currentMode ? 'peak-current' : 'voltage';
	const label = (kind: 'loop' | 'plant' | 'compensator', which: string) => traceName(kind, which, control);
	const traces: ExportTrace[] = [];
	const kinds = (['compensator', 'plant', 'loop'] as const).filter((k) => show[k]);
	for (const k of kinds) traces.push({ kind: k, label: label(k, 'nominal'), nominal: true, magDb: r[k].magDb, phaseDeg: r[k].phaseDeg });
	for (const c of options.corners ?? []) {
		const cr = c.response.response;
		if (cr.freqHz.length !== r.freqHz.length) continue; // a corner on another grid cannot share the x array
		for (const k of kinds) traces.push({ kind: k, label: label(k, c.label), nominal: false, magDb: cr[k].magDb, phaseDeg: cr[k].phaseDeg });
	}
	if (show.loop) {
		for (const c of options.cornerLoops ?? []) {
			if (c.magDb.length !== r.freqHz.length) continue;
			traces.push({ kind: 'loop', label: label('loop', c.label), nominal: false, magDb: c.magDb, phaseDeg: c.phaseDeg });
		}
	}
	const m = response.metrics;
	return {
		freqHz: r.freqHz,
		traces,
		measured: options.measured,
		crossover: m.crossoverHz !== null && m.phaseMarginDeg !== null ? { freqHz: m.crossoverHz, phaseMarginDeg: m.phaseMarginDeg } : null,
		gainMargin: m.phaseCrossoverHz !== null && m.gainMarginDb !== null ? { freqHz: m.phaseCrossoverHz, gainMarginDb: m.gainMarginDb } : null,
		modelLimitHz: options.fswHz ? options.fswHz / 2 : null,
		title: options.title,
		control
	};
}

/** Finite poles and zeros of the network that would be built, for the lane of the plot. */
export function networkRoots(response: AnalysisResponse): NonNullable<BodeSvgOptions['roots']> {
	const net = response.compensator.rounded ?? response.compensator.ideal;
	return [
		...net.zerosHz.filter((f) => f > 0).map((freqHz) => ({ type: 'zero' as const, freqHz })),
		...net.polesHz.filter((f) => f > 0).map((freqHz) => ({ type: 'pole' as const, freqHz }))
	];
}

function traceName(kind: 'loop' | 'plant' | 'compensator', which: string, control: ControlMode): string {
	const base = kind === 'loop' ? 'Loop gain T' : kind === 'plant' ? plantTraceLabel(control) : 'Network Gc';
	return which === 'nominal' ? base : `${base}, ${which}`;
}
