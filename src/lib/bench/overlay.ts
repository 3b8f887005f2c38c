/**
 * Everything the overlay of bench data on the model shows: the measured margins (for a loop-gain file) and the
 * model-versus-measurement deviation over the band both cover, clipped to fsw/2 where the averaged model stops
 * (docs/formulas.md §0). The model is any evaluator; `sampledEvaluator` turns an analysis response's arrays into one.
 */
import { benchDeviation, type DeviationResult } from './deviation';
import { benchMetrics } from './metrics';
import type { BenchData, BenchMetrics, ModelEvaluator } from './types';

export interface BenchOverlay {
	/** Measured margins; null for a plant file (margins belong to a loop gain). */
	metrics: BenchMetrics | null;
	deviation: DeviationResult;
}

export function benchOverlay(
	data: Pick<BenchData, 'freqHz' | 'magDb' | 'phaseDeg'>,
	model: ModelEvaluator,
	options: { kind: 'loop' | 'plant'; fswHz?: number; startHz?: number; stopHz?: number }
): BenchOverlay {
	const limit = options.fswHz ? options.fswHz / 2 : Infinity;
	const stopHz = Math.min(options.stopHz ?? Infinity, limit);
	return {
		metrics: options.kind === 'loop' ? benchMetrics(data) : null,
		deviation: benchDeviation(data, model, { startHz: options.startHz, stopHz: Number.isFinite(stopHz) ? stopHz : undefined })
	};
}
