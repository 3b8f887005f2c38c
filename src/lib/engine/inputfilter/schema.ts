/**
 * zod schema of the design document's optional `inputFilter` section: Lf (with its series
 * resistance), Cf, and the damping branch Rd + Cd across Cf — given as parts, as the optimum
 * for a ratio n = Cd/Cf (docs/formulas.md §9), or null for none. `marginDb` is the Middlebrook margin
 * required between |Zs| and both |ZN| and |ZD| [common practice: 6 dB].
 */
import { z } from 'zod';

const num = (unit: string) => z.number({ error: `must be a number (${unit})` });
const positive = (unit: string) => num(unit).positive({ error: 'must be > 0' });

export const dampingSchema = z.union(
	[
		z.object({ rd: positive('Ω'), cd: positive('F') }).strict(),
		z.object({ optimalRatio: positive('Cd/Cf').max(100, { error: 'must be ≤ 100' }) }).strict(),
		z.null()
	],
	{ error: 'must be { rd, cd }, { optimalRatio } or null' }
);

export const inputFilterSchema = z
	.object({
		l: positive('H'),
		dcr: num('Ω').nonnegative({ error: 'must be ≥ 0' }).default(0),
		c: positive('F'),
		damping: dampingSchema.default(null),
		marginDb: num('dB').min(0, { error: 'must be ≥ 0 dB' }).max(40, { error: 'must be ≤ 40 dB' }).default(6)
	})
	.strict();

export type InputFilterDoc = z.infer<typeof inputFilterSchema>;
