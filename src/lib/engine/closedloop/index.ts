/**
 * Closed-loop behaviour and robustness: closed-loop responses and transients (closedloop/,
 * timeresponse/), corners (corners/), Monte Carlo (spread/), input filter (inputfilter/).
 * Entry points: analyzeClosedLoop, runCorners, runSpread / createSpreadRun / runSpreadChunked,
 * analyzeInputFilter; zod schemas loadStepSchema, tolerancesSchema, cornersSchema, spreadSchema,
 * inputFilterSchema for the optional design-document sections.
 */
export * from './closedLoopTf';
export * from './responses';
export * from './analyzeClosedLoop';
export * from '../timeresponse/stepResponse';
export * from '../timeresponse/ruleOfThumb';
export * from '../timeresponse/metrics';
export { modalForm } from '../timeresponse/modal';
export { loadStepSchema, type LoadStepDoc } from '../timeresponse/schema';
export * from '../corners/loopModel';
export * from '../corners/variation';
export * from '../corners/corners';
export * from '../corners/schema';
export * from '../spread/spread';
export * from '../spread/histogram';
export * from '../spread/schema';
export { createRng, type Rng } from '../spread/prng';
export * from '../inputfilter/filter';
export * from '../inputfilter/analyzeInputFilter';
export * from '../inputfilter/schema';
