/** The verdict of a design document: verifyDesign and its types and rules. */
export * from './types';
export * from './verifyDesign';
export { verdictOf as verdictRulesOf, MODEL_WARNING_CODES, PM_CAUTION_DEG, GM_CAUTION_DB, YIELD_FAIL_BELOW } from './rules';
export { cornerChecksFor } from './checks';
export * from './text';
