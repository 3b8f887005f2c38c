/**
 * Messages between the design screen and the Monte Carlo worker (spread.worker.ts). The
 * worker runs the engine's chunked spread and reports progress after every chunk; a cancel
 * message stops it between chunks and the samples done so far are summarised.
 */
import type { LoopSpec } from '$lib/engine/corners/loopModel';
import type { SpreadConfig, SpreadResult } from '$lib/engine/spread/spread';

export type SpreadSummary = Omit<SpreadResult, 'crossoverHz' | 'phaseMarginDeg' | 'gainMarginDb' | 'stable'>;

export type ToWorker = { type: 'start'; runId: number; spec: LoopSpec; config: SpreadConfig } | { type: 'cancel'; runId: number };

export type FromWorker =
	| { type: 'progress'; runId: number; done: number; total: number }
	| { type: 'result'; runId: number; summary: SpreadSummary; elapsedMs: number }
	| { type: 'error'; runId: number; message: string };

export function summarise(r: SpreadResult): SpreadSummary {
	const { crossoverHz: _fc, phaseMarginDeg: _pm, gainMarginDb: _gm, stable: _st, ...summary } = r;
	return summary;
}
