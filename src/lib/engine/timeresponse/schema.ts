/**
 * zod schema of the design document's optional `loadStep` section: the load-current step
 * ΔI with its linear rise time, and the reference step, for the closed-loop time responses.
 * SI units (A, s, V). Messages name the rule; zod adds the field path.
 */
import { z } from 'zod';

const num = (unit: string) => z.number({ error: `must be a number (${unit})` });
const nonZero = (unit: string) => num(unit).refine((x) => x !== 0 && Number.isFinite(x), { error: 'must be a finite number ≠ 0' });

export const loadStepSchema = z
	.object({
		/** Load-current step, A (positive = more load) [0.5·iout]. */
		step: nonZero('A').optional(),
		/** Linear rise time of the load edge, s [1 µs]. */
		riseTime: num('s').nonnegative({ error: 'must be ≥ 0' }).max(1, { error: 'must be ≤ 1 s' }).default(1e-6),
		/** Reference step, V [1 % of vref]. */
		referenceStep: nonZero('V').optional(),
		/** Simulated time after the step, s [from the closed-loop poles]. */
		duration: num('s').positive({ error: 'must be > 0' }).max(10, { error: 'must be ≤ 10 s' }).optional(),
		/** Settling band as a fraction of the peak deviation (load) or of the step (reference) [0.02]. */
		settleFraction: num('fraction').gt(0, { error: 'must be > 0' }).max(0.5, { error: 'must be ≤ 0.5' }).default(0.02)
	})
	.strict();

export type LoadStepDoc = z.infer<typeof loadStepSchema>;
