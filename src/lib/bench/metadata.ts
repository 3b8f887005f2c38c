/**
 * Metadata stored with a bench file under its rail: what was measured (loop gain or plant), at which conditions,
 * with which instrument and injection point, and when. zod schema shared by the upload form and the API.
 */
import { z } from 'zod';

export const benchMetadataSchema = z.object({
	/** What the file holds: the loop gain T, or the control-to-output plant Gvd. */
	kind: z.enum(['loop', 'plant'], { error: 'must be "loop" or "plant"' }).default('loop'),
	/** Operating conditions of the measurement, V and A. */
	vin: z.number({ error: 'must be a number (V)' }).positive({ error: 'must be > 0' }).optional(),
	iout: z.number({ error: 'must be a number (A)' }).nonnegative({ error: 'must be ≥ 0' }).optional(),
	instrument: z.string().trim().max(120, { error: 'at most 120 characters' }).optional(),
	/** Where the injection resistor sat, in words ("10 Ω between Vout and R1"). */
	injectionPoint: z.string().trim().max(200, { error: 'at most 200 characters' }).optional(),
	/** Date of the measurement, ISO 8601 (YYYY-MM-DD or a full timestamp). */
	measuredAt: z
		.string()
		.refine((s) => /^\d{4}-\d{2}-\d{2}/.test(s) && !Number.isNaN(Date.parse(s)), { error: 'must be an ISO date (YYYY-MM-DD)' })
		.optional(),
	notes: z.string().trim().max(2000, { error: 'at most 2000 characters' }).optional(),
	/** How the analyzer reports phase (see BenchParseOptions.phaseReference). */
	phaseReference: z.enum(['loop-gain', 'inverted'], { error: 'must be "loop-gain" or "inverted"' }).default('loop-gain')
});

export type BenchMetadata = z.infer<typeof benchMetadataSchema>;
