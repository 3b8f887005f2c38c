/**
 * Bench data: measured Bode files from a frequency response analyzer, read into canonical form (Hz, dB, unwrapped
 * degrees), their measured margins, and the model-versus-measurement deviation. Pure; safe in browser and server.
 */
export * from './types';
export { parseBenchFile, BENCH_MAX_BYTES, BENCH_MAX_ROWS, HEADER_SEARCH_LINES } from './parse';
export { benchMetrics, measuredCrossovers, measuredPhaseCrossovers, reduceDeg, type MeasuredResponse } from './metrics';
export { benchDeviation, sampledEvaluator, type DeviationOptions, type DeviationResult } from './deviation';
export { unwrapPhaseDeg } from './unwrap';
export { matchHeader, headerTokens } from './columns';
export { benchMetadataSchema, type BenchMetadata } from './metadata';
export { benchOverlay, type BenchOverlay } from './overlay';
