// How many cases each property runs: PROPERTY_RUNS from the environment (the nightly script
// sets 10 000), else a small default so `npm test` stays fast. PROPERTY_SEED replays a failure.
import fc from 'fast-check';

export function propertyRuns(fallback = 200): number {
	const fromEnv = Number(process.env.PROPERTY_RUNS);
	return Number.isInteger(fromEnv) && fromEnv > 0 ? fromEnv : fallback;
}

/** The seed of every property in `npm test` (any fixed number; changing it is a new exploration). */
const FIXED_SEED = 20261201;

/** Parameters for fc.assert: the run count, and the seed when one is given to replay. */
export function propertyParams(fallback = 200): fc.Parameters<unknown> {
	const seed = Number(process.env.PROPERTY_SEED);
	// In `npm test` a failure is reported at once with its seed and path (replay with
	// PROPERTY_SEED): shrinking an analysis-heavy property can take minutes. Nightly runs shrink.
	const endOnFailure = !process.env.PROPERTY_RUNS;
	// `npm test` uses one fixed seed so CI is reproducible; the nightly script explores new seeds.
	const chosen = Number.isInteger(seed) ? seed : process.env.PROPERTY_RUNS ? undefined : FIXED_SEED;
	return { numRuns: propertyRuns(fallback), endOnFailure, ...(chosen === undefined ? {} : { seed: chosen }) };
}

/** Time allowed for one property test: two minutes in `npm test`, an hour for nightly-sized runs. */
export function propertyTimeout(): number {
	return process.env.PROPERTY_RUNS ? 3_600_000 : 120_000;
}
