/** Engineering notation in and out: `parseEng`/`parseQuantity` for typed values, `formatEng` for display. */
export { parseEng, parseQuantity, type ParseResult, type ParseOptions, type QuantityRule } from './parse';
export { formatEng, formatPart, formatForInput, formatDeg, formatDb, formatPercent, COMPONENT_DIGITS, DEFAULT_DIGITS } from './format';
export { PREFIX_EXPONENT, DISPLAY_PREFIX, PREFIX_HELP } from './prefixes';
export type { UnitSymbol } from './quantities';
