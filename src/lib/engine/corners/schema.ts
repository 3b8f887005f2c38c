/**
 * zod schemas of the design document's optional `tolerances` and `corners` sections.
 * tolerances: per part a relative limit `tol` (0.1 = ±10 %) and, for Monte Carlo, a
 * distribution (uniform in ±tol, or normal with σ = tol/sigmas truncated at ±tol).
 * corners: the input-voltage and load ranges; every combination is run with the tolerance corners.
 */
import { z } from 'zod';
import { PART_NAMES } from './variation';

/** Most corners run exhaustively; above it the tolerances go one at a time plus the linearised
 * worst cases, which is how a practitioner handles many tolerances anyway. Also the default. */
export const MAX_CORNERS = 4096;

const num = (unit: string) => z.number({ error: `must be a number (${unit})` });

export const partToleranceSchema = z
	.object({
		tol: num('fraction').min(0, { error: 'must be ≥ 0' }).max(0.9, { error: 'must be ≤ 0.9 (±90 %)' }),
		dist: z.enum(['uniform', 'normal'], { error: 'must be "uniform" or "normal"' }).default('uniform'),
		sigmas: num('σ').gt(0, { error: 'must be > 0' }).max(10, { error: 'must be ≤ 10' }).default(3)
	})
	.strict();

export const tolerancesSchema = z.partialRecord(z.enum(PART_NAMES, { error: `must be one of ${PART_NAMES.join(', ')}` }), partToleranceSchema);

const rangeSchema = (unit: string) =>
	z
		.object({ min: num(unit).positive({ error: 'must be > 0' }), max: num(unit).positive({ error: 'must be > 0' }) })
		.strict()
		.refine((r) => r.min <= r.max, { error: 'min must be ≤ max', path: ['min'] });

export const cornersSchema = z
	.object({
		/** Input-voltage range (the nominal is plant.vin). */
		vin: rangeSchema('V').optional(),
		/** Load-current range. */
		iout: rangeSchema('A').optional(),
		/** Ambient / part temperature range, °C (the nominal is 25 °C): capacitor classes, DCR and RDS(on) follow it. */
		temperature: z
			.object({
				min: num('°C').min(-60, { error: 'must be ≥ −60 °C' }).max(200, { error: 'must be ≤ 200 °C' }),
				max: num('°C').min(-60, { error: 'must be ≥ −60 °C' }).max(200, { error: 'must be ≤ 200 °C' })
			})
			.strict()
			.refine((r) => r.min <= r.max, { error: 'min must be ≤ max', path: ['min'] })
			.optional(),
		/** Above this many corners, tolerances are run one at a time plus linearised worst cases [4096]. */
		maxCorners: num('corners')
			.int({ error: 'must be a whole number' })
			.min(1, { error: 'must be ≥ 1' })
			.max(MAX_CORNERS, { error: `must be ≤ ${MAX_CORNERS} (more tolerances run one at a time plus the linearised worst cases)` })
			.default(MAX_CORNERS)
	})
	.strict();

export type TolerancesDoc = z.infer<typeof tolerancesSchema>;
export type CornersDoc = z.infer<typeof cornersSchema>;
