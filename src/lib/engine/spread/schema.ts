/**
 * zod schema of the design document's optional `spread` section (Monte Carlo): sample count,
 * seed (a run with the same seed and tolerances reproduces exactly), yield targets and bins.
 * Part tolerances come from the `tolerances` section (corners/schema.ts).
 */
import { z } from 'zod';
import { DEFAULT_SAMPLES, MAX_SAMPLES } from './limits';

const num = (unit: string) => z.number({ error: `must be a number (${unit})` });

export const spreadTargetsSchema = z
	.object({
		phaseMarginDeg: num('degrees').optional(),
		gainMarginDb: num('dB').optional(),
		crossoverHz: z
			.object({ min: num('Hz').positive({ error: 'must be > 0' }).optional(), max: num('Hz').positive({ error: 'must be > 0' }).optional() })
			.strict()
			.optional()
	})
	.strict();

export const spreadSchema = z
	.object({
		samples: num('samples').int({ error: 'must be a whole number' }).min(1, { error: 'must be ≥ 1' }).max(MAX_SAMPLES, { error: `must be ≤ ${MAX_SAMPLES}` }).default(DEFAULT_SAMPLES),
		seed: num('seed').int({ error: 'must be a whole number' }).min(0, { error: 'must be ≥ 0' }).max(2 ** 32 - 1, { error: 'must be < 2^32' }).default(1),
		/** Absent = the document's targets (contract/targetsSchema.ts spreadTargetsOf). */
		targets: spreadTargetsSchema.optional(),
		bins: num('bins').int({ error: 'must be a whole number' }).min(2, { error: 'must be ≥ 2' }).max(400, { error: 'must be ≤ 400' }).default(40)
	})
	.strict();

export type SpreadDoc = z.infer<typeof spreadSchema>;
