/** Fitting uncertain parameters of a design to a measured response (docs/formulas.md §11). */
export * from './schema';
export { fitMeasurement, modelLogResponse, fitPoints, fitError, Z95, type FitResult, type FitError, type FittedParameter, type Measurement, type ResidualSummary, type FitInput } from './fitMeasurement';
export { fitDesign, fittedDocument, fitProvenance, type FitDesignInput } from './fitDesign';
export { levenbergMarquardt, type LmOptions, type LmResult, type FitLoss } from './levenbergMarquardt';
export { DEFAULT_FACTOR_RANGE, resolveParameters, specAt, type ResolvedParameter } from './parameters';
