/**
 * zod schema of a fit request: which parameters are uncertain, which measured response they are
 * fitted to, over which band, with which loss. Shared by the API route, the CLI and the engine.
 * The caps bound the work of one request (parameters × points × iterations).
 */
import { z } from 'zod';

/**
 * Parameters a fit may estimate. c, esr, esl are per capacitor branch (`branch`, 0-based);
 * vramp is voltage mode's modulator gain, senseGain (Ri) and rampSlope (Se) peak current mode's.
 */
export const FIT_PARAMETER_NAMES = ['l', 'dcr', 'c', 'esr', 'esl', 'vramp', 'senseGain', 'rampSlope', 'delay'] as const;
export type FitParameterName = (typeof FIT_PARAMETER_NAMES)[number];
export const BRANCH_PARAMETERS: readonly FitParameterName[] = ['c', 'esr', 'esl'];

/** The measured response: loop gain T, control-to-output Gvd, or closed-loop output impedance Zo/(1 + T). */
export const FIT_RESPONSES = ['loop', 'plant', 'output-impedance'] as const;
export type FitResponse = (typeof FIT_RESPONSES)[number];

export const FIT_MAX_PARAMETERS = 12;
export const FIT_MAX_ITERATIONS = 200;
/** Measured points used at most; a longer file is thinned evenly (first and last kept). */
export const FIT_MAX_POINTS = 1000;

const num = (unit: string) => z.number({ error: `must be a number (${unit})` });

export const fitParameterSchema = z
	.object({
		name: z.enum(FIT_PARAMETER_NAMES, { error: `must be one of ${FIT_PARAMETER_NAMES.join(', ')}` }),
		/** Capacitor branch for c, esr, esl (0-based; default 0). */
		branch: num('index').int({ error: 'must be a whole number' }).min(0, { error: 'must be ≥ 0' }).max(7, { error: 'must be ≤ 7' }).optional(),
		/**
		 * Search range as multiples of the typed value (delay: seconds). Absent: 0.25…4 × typed
		 * (delay: 0…4 switching periods); the answer says whether the fit left the tolerance.
		 */
		min: num('factor').positive({ error: 'must be > 0' }).optional(),
		max: num('factor').positive({ error: 'must be > 0' }).optional()
	})
	.strict()
	.refine((p) => p.min === undefined || p.max === undefined || p.min < p.max, { error: 'min must be < max', path: ['min'] });

/** The fit request's fields, without the cross-field rules (so a route can add its own fields). */
export const fitRequestFields = z
	.object({
		parameters: z
			.array(fitParameterSchema, { error: 'must be a list of parameters' })
			.min(1, { error: 'mark at least one parameter as uncertain' })
			.max(FIT_MAX_PARAMETERS, { error: `at most ${FIT_MAX_PARAMETERS} parameters` }),
		/** Absent: what the bench file holds (loop or plant). */
		response: z.enum(FIT_RESPONSES, { error: `must be one of ${FIT_RESPONSES.join(', ')}` }).optional(),
		/** Band of the fit, Hz; default the measured band up to fsw/2 (the averaged model's reach). */
		startHz: num('Hz').positive({ error: 'must be > 0' }).optional(),
		stopHz: num('Hz').positive({ error: 'must be > 0' }).optional(),
		loss: z.enum(['soft-l1', 'linear'], { error: 'must be "soft-l1" or "linear"' }).default('soft-l1'),
		/** Residual scale of the soft-L1 loss, in the log-response units of the residual (0.05 ≈ 0.43 dB or 2.9°). */
		fScale: num('log units').min(1e-4, { error: 'must be ≥ 0.0001' }).max(10, { error: 'must be ≤ 10' }).default(0.05),
		maxIterations: num('iterations').int({ error: 'must be a whole number' }).min(1, { error: 'must be ≥ 1' }).max(FIT_MAX_ITERATIONS, { error: `must be ≤ ${FIT_MAX_ITERATIONS}` }).default(60)
	})
	.strict();

type FitFieldsShape = { startHz?: number; stopHz?: number; parameters: { name: FitParameterName; branch?: number }[] };

/** The cross-field rules of a fit request: an ordered band, each parameter once. */
export function withFitRules<T extends z.ZodType<FitFieldsShape>>(schema: T) {
	return schema
		.refine((r) => r.startHz === undefined || r.stopHz === undefined || r.startHz < r.stopHz, { error: 'startHz must be < stopHz', path: ['startHz'] })
		.refine(
			(r) => {
				const keys = r.parameters.map((p) => `${p.name}.${BRANCH_PARAMETERS.includes(p.name) ? (p.branch ?? 0) : ''}`);
				return new Set(keys).size === keys.length;
			},
			{ error: 'each parameter at most once', path: ['parameters'] }
		);
}

export const fitRequestSchema = withFitRules(fitRequestFields);

export type FitRequest = z.infer<typeof fitRequestSchema>;
export type FitRequestInput = z.input<typeof fitRequestSchema>;
export type FitParameterSpec = z.infer<typeof fitParameterSchema>;
