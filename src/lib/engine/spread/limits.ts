/**
 * The spread's sample-count limits, in a module that imports nothing: the section's schema and
 * the Monte Carlo both read them, and spread.ts sits on an import cycle through the loop model and
 * the design schema, so a constant defined there can be read before it is initialised (the
 * production spread worker failed with exactly that).
 */

/** 10 000 samples resolve a yield to 0.01 %; the cost is samples × one loop analysis. */
export const MAX_SAMPLES = 10000;
export const DEFAULT_SAMPLES = 1000;
