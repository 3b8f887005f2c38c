// How many cases each property runs: PROPERTY_RUNS from the environment (the nightly script
// sets 10 000), else a small default so `npm test` stays fast. PROPERTY_SEED replays a failure.
import fc from 'fast-check';

export function propertyRuns(fallback = 200): number {
	const fromEnv = Number(process.env.PROPERTY_RUNS);
	return Number.isInteger(fromEnv) && fromEnv > 0 ? fromEnv : fallback;
}

/** Parameters for fc.assert: the run count, and the seed when one is given to replay. */
export function propertyParams(fallback = 200): fc.Parameters<unknown> {
	const seed = Number(process.env.PROPERTY_SEED);
	// In `npm test` a failure is reported at once with its seed and path (replay with
	// PROPERTY_SEED): shrinking an analysis-heavy property can take minutes. Nightly runs shrink.
	const endOnFailure = !process.env.PROPERTY_RUNS;
	return { numRuns: propertyRuns(fallback), endOnFailure, ...(Number.isInteger(seed) ? { seed } : {}) };
}

/** Time allowed for one property test: two minutes in `npm test`, an hour for nightly-sized runs. */
export function propertyTimeout(): number {
	return process.env.PROPERTY_RUNS ? 3_600_000 : 120_000;
}
