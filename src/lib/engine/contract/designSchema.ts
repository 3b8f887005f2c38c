/**
 * zod schema of the design document, contract v1 (spec: design-document.md). SI units; every
 * message names the rule, zod adds the field path. Rules: L, C, fsw, vin, vout, iout, vramp > 0;
 * buck vout < vin, boost vout > vin; vref ≤ vout; sweep startHz < stopHz, 2 ≤ points ≤ 5000.
 * The operating-point rules (duty < 0.95, boost below its maximum gain) need the model and are
 * checked in analyze.ts; they come back in the same error shape.
 * Cost limits (README, "Limits"): every field that scales the work has a ceiling a practitioner
 * would not reach. The loop delay is at most MAX_DELAY_PERIODS switching periods and the sweep
 * ends by MAX_SWEEP_FSW_MULTIPLE × fsw, because each 1/delay Hz of analysed range adds one phase
 * crossover (∠e^(−jωTd) = −360°·f·Td) that the metrics bracket, refine and list, at every corner
 * and spread sample: a 1 s delay over 6 MHz was six million crossovers and 500 MB of answer.
 * Together they allow at most 4 × 10 = 40 delay turns over the analysed range.
 */
import { z } from 'zod';
import { compensatorSchema } from '../compensators/schema';
import { cornersSchema, tolerancesSchema } from '../corners/schema';
import { inputFilterSchema } from '../inputfilter/schema';
import { spreadSchema } from '../spread/schema';
import { loadStepSchema } from '../timeresponse/schema';
import { targetsSchema } from './targetsSchema';
import { formatEng } from '../../units/format';
import { temperatureClass } from '../plants/derating';

export const SCHEMA_VERSION = 1;
/** Bode points of a sweep: network analysers give a few hundred to 1601; 5000 leaves room. */
export const MAX_SWEEP_POINTS = 5000;
export const DEFAULT_SWEEP_POINTS = 400;
/** Longest loop delay in switching periods (a sampled modulator's delay is half a period to two). */
export const MAX_DELAY_PERIODS = 4;
/** Highest sweep frequency as a multiple of fsw (the averaged model itself ends at fsw/2). */
export const MAX_SWEEP_FSW_MULTIPLE = 10;

const missingOr = (message: string) => (issue: { input?: unknown }) => (issue.input === undefined ? 'is required' : message);
const num = (unit: string) => z.number({ error: missingOr(`must be a number (${unit})`) });
const positive = (unit: string) => num(unit).positive({ error: 'must be > 0' });
const nonNegative = (unit: string) => num(unit).nonnegative({ error: 'must be ≥ 0' });
/** > 0 and inside a sane physical range, so the arithmetic never under- or overflows. */
const inRange = (unit: string, min: number, max: number) =>
	positive(unit)
		.min(min, { error: `must be ≥ ${min} ${unit}` })
		.max(max, { error: `must be ≤ ${max} ${unit}` });

/** C(V) of one part: measured points (V, C per part) or the curve C0 / (1 + (V/V0)^k). */
const dcBiasSchema = z.union(
	[
		z
			.object({
				points: z
					.array(z.object({ v: positive('V').max(1e4, { error: 'must be ≤ 10 kV' }), c: positive('F').max(100, { error: 'must be ≤ 100 F' }) }).strict(), {
						error: 'must be a list of { v, c } points'
					})
					.min(1, { error: 'needs at least one point' })
					.max(12, { error: 'at most 12 points' })
			})
			.strict(),
		z.object({ v0: positive('V').max(1e4, { error: 'must be ≤ 10 kV' }), k: positive('exponent').max(10, { error: 'must be ≤ 10' }) }).strict()
	],
	{ error: 'must be { points: [{ v, c }] } or { v0, k }' }
);

export const capacitorBranchSchema = z.object(
	{
	c: inRange('F', 1e-12, 100),
	esr: nonNegative('Ω')
		.max(1e3, { error: 'must be ≤ 1000 Ω' })
		.refine((x) => x === 0 || x >= 1e-9, { error: 'must be 0 or ≥ 1e-9 Ω' })
		.default(0),
	esl: nonNegative('H')
		.max(1e-3, { error: 'must be ≤ 0.001 H' })
		.refine((x) => x === 0 || x >= 1e-15, { error: 'must be 0 or ≥ 1e-15 H' })
		.default(0),
	count: num('parts').int({ error: 'must be a whole number' }).min(1, { error: 'must be ≥ 1' }).max(1000, { error: 'must be ≤ 1000' }).default(1),
	// Derating (plants/derating.ts), all optional: absent = the typed value at every corner.
	dcBias: dcBiasSchema.optional(),
	tempClass: z
		.string({ error: 'must be a class code such as X7R, X5R or C0G' })
		.refine((s) => temperatureClass(s) !== null, { error: 'must be a class code such as X7R, X5R, X6S or C0G' })
		.optional(),
	ageing: num('fraction').min(0, { error: 'must be ≥ 0' }).max(0.5, { error: 'must be ≤ 0.5 (50 %)' }).optional()
	},
	{ error: missingOr('must be an object { c, esr, esl, count }') }
);

export const plantSchema = z
	.object({
		topology: z.enum(['buck', 'boost'], { error: missingOr('must be "buck" or "boost"') }),
		vin: inRange('V', 1e-3, 1e5),
		vout: inRange('V', 1e-3, 1e5),
		iout: inRange('A', 1e-6, 1e5),
		fsw: inRange('Hz', 1, 1e9),
		inductor: z.object(
			{ l: inRange('H', 1e-12, 100), dcr: nonNegative('Ω').max(1e3, { error: 'must be ≤ 1000 Ω' }).default(0) },
			{ error: missingOr('must be an object { l, dcr }') }
		),
		capacitors: z
			.array(capacitorBranchSchema, { error: 'must be a list of capacitor branches' })
			.min(1, { error: 'needs at least one capacitor branch' })
			.max(8, { error: 'at most 8 capacitor branches' }),
		rdsOn: nonNegative('Ω').max(1e3, { error: 'must be ≤ 1000 Ω' }).default(0),
		/** Optional part data for the loss estimate (plants/losses.ts); absent = conduction only. */
		losses: z
			.object({
				riseTime: nonNegative('s').max(1e-5, { error: 'must be ≤ 10 µs' }).optional(),
				fallTime: nonNegative('s').max(1e-5, { error: 'must be ≤ 10 µs' }).optional(),
				coss: nonNegative('F').max(1e-6, { error: 'must be ≤ 1 µF' }).optional(),
				qrr: nonNegative('C').max(1e-5, { error: 'must be ≤ 10 µC' }).optional(),
				deadTime: nonNegative('s').max(1e-5, { error: 'must be ≤ 10 µs' }).optional(),
				bodyDiodeVf: nonNegative('V').max(5, { error: 'must be ≤ 5 V' }).optional(),
				qg: nonNegative('C').max(1e-5, { error: 'must be ≤ 10 µC' }).optional(),
				gateDrive: nonNegative('V').max(30, { error: 'must be ≤ 30 V' }).optional(),
				coreLoss: nonNegative('W').max(1e4, { error: 'must be ≤ 10 kW' }).optional(),
				/** Forward drop of the rectifier diode (plant.lightLoad 'diode'). */
				diodeVf: nonNegative('V').max(5, { error: 'must be ≤ 5 V' }).optional()
			})
			.strict()
			.optional(),
		/** Relative rise of rdsOn per °C above 25 °C (e.g. 0.004), for temperature corners [none]. */
		rdsOnTempco: nonNegative('1/°C').max(0.05, { error: 'must be ≤ 0.05 per °C' }).optional(),
		/**
		 * Light-load behaviour: 'forced-ccm' (synchronous, the CCM model holds at any load),
		 * 'diode-emulation' (synchronous, enters DCM below the boundary) or 'diode' (a diode
		 * rectifier, enters DCM). Absent = as before: DCM is warned about, not excluded.
		 */
		lightLoad: z.enum(['forced-ccm', 'diode-emulation', 'diode'], { error: 'must be "forced-ccm", "diode-emulation" or "diode"' }).optional()
	}, { error: missingOr('must be an object') })
	.superRefine((p, ctx) => {
		if (p.topology === 'buck' && !(p.vout < p.vin)) {
			ctx.addIssue({ code: 'custom', path: ['vout'], message: 'must be < vin for a buck' });
		}
		if (p.topology === 'boost' && !(p.vout > p.vin)) {
			ctx.addIssue({ code: 'custom', path: ['vout'], message: 'must be > vin for a boost' });
		}
	});

/** Ramp amplitude a peak-current document is given when it names none (vramp is not used there). */
export const UNUSED_VRAMP = 1;

/**
 * Voltage mode (default): vramp and feedForward as always. Peak current mode (docs/formulas.md
 * §14): senseGain Ri (V/A) is required, rampSlope Se (V/s at the comparator) defaults to 0, vramp
 * may be left out (it is not used) and feed-forward does not apply (the current loop already
 * follows the input).
 */
export const modulatorSchema = z
	.object(
		{
			control: z.enum(['voltage', 'peak-current'], { error: 'must be "voltage" or "peak-current"' }).default('voltage'),
			vramp: inRange('V', 1e-6, 1e4).optional(),
			feedForward: z.boolean({ error: 'must be true or false' }).default(false),
			delay: nonNegative('s').max(1, { error: 'must be ≤ 1 s' }).default(0),
			senseGain: inRange('V/A', 1e-6, 1e3).optional(),
			rampSlope: nonNegative('V/s').max(1e13, { error: 'must be ≤ 1e13 V/s' }).optional()
		},
		{ error: missingOr('must be an object { vramp, feedForward, delay }') }
	)
	.superRefine((m, ctx) => {
		if (m.control !== 'peak-current') {
			if (m.vramp === undefined) ctx.addIssue({ code: 'custom', path: ['vramp'], message: 'is required' });
			return;
		}
		if (m.senseGain === undefined) ctx.addIssue({ code: 'custom', path: ['senseGain'], message: 'is required with control "peak-current" (sense resistance × amplifier gain, V/A)' });
		if (m.feedForward) ctx.addIssue({ code: 'custom', path: ['feedForward'], message: 'must be false with control "peak-current" (the current loop already follows the input)' });
	})
	.transform((m) => ({ ...m, vramp: m.vramp ?? UNUSED_VRAMP }));

export const feedbackSchema = z.object({
	vref: inRange('V', 1e-3, 1e5),
	r1: inRange('Ω', 1e-3, 1e9)
}, { error: missingOr('must be an object { vref, r1 }') });

const rangeSweepSchema = z
	.object({
		startHz: inRange('Hz', 1e-6, 1e12),
		stopHz: inRange('Hz', 1e-6, 1e12),
		points: num('points')
			.int({ error: 'must be a whole number' })
			.min(2, { error: 'must be ≥ 2' })
			.max(MAX_SWEEP_POINTS, { error: `must be ≤ ${MAX_SWEEP_POINTS}` })
			.default(DEFAULT_SWEEP_POINTS)
	})
	.strict()
	.superRefine((s, ctx) => {
		if (!(s.startHz < s.stopHz)) ctx.addIssue({ code: 'custom', path: ['startHz'], message: 'must be < stopHz' });
	});

const listSweepSchema = z
	.object({
		freqHz: z
			.array(inRange('Hz', 1e-6, 1e12), { error: 'must be a list of frequencies (Hz)' })
			.min(1, { error: 'needs at least one frequency' })
			.max(MAX_SWEEP_POINTS, { error: `at most ${MAX_SWEEP_POINTS} frequencies` })
	})
	.strict();

export const sweepSchema = z.union([rangeSweepSchema, listSweepSchema], {
	error: 'must be { startHz, stopHz, points } or { freqHz: [...] }'
});

export const designDocumentSchema = z
	.object({
		schemaVersion: z.literal(SCHEMA_VERSION, { error: missingOr(`must be ${SCHEMA_VERSION}`) }),
		name: z.string().max(200).optional(),
		plant: plantSchema,
		modulator: modulatorSchema,
		feedback: feedbackSchema,
		compensator: z.custom<unknown>((v) => v !== undefined, { error: 'is required' }).pipe(compensatorSchema),
		sweep: sweepSchema.optional(),
		// The verification spec (targets, operating ranges, tolerances, spread settings) and the
		// optional robustness sections (closed loop, corners, Monte Carlo, input filter).
		targets: targetsSchema.optional(),
		loadStep: loadStepSchema.optional(),
		tolerances: tolerancesSchema.optional(),
		corners: cornersSchema.optional(),
		spread: spreadSchema.optional(),
		inputFilter: inputFilterSchema.optional()
	})
	.superRefine((d, ctx) => {
		if (!(d.feedback.vref <= d.plant.vout)) {
			ctx.addIssue({ code: 'custom', path: ['feedback', 'vref'], message: 'must be ≤ plant.vout' });
		}
		const fsw = d.plant.fsw;
		const maxDelay = MAX_DELAY_PERIODS / fsw;
		if (d.modulator.delay > maxDelay) {
			ctx.addIssue({
				code: 'custom',
				path: ['modulator', 'delay'],
				message: `must be ≤ ${MAX_DELAY_PERIODS} switching periods (${MAX_DELAY_PERIODS} / plant.fsw = ${formatEng(maxDelay, 's')})`
			});
		}
		const maxStop = MAX_SWEEP_FSW_MULTIPLE * fsw;
		const s = d.sweep;
		if (s && 'stopHz' in s && s.stopHz > maxStop) {
			ctx.addIssue({ code: 'custom', path: ['sweep', 'stopHz'], message: `must be ≤ ${MAX_SWEEP_FSW_MULTIPLE} × plant.fsw (${formatEng(maxStop, 'Hz')})` });
		}
		if (s && 'freqHz' in s) {
			const i = s.freqHz.findIndex((f) => f > maxStop);
			if (i >= 0) ctx.addIssue({ code: 'custom', path: ['sweep', 'freqHz', i], message: `must be ≤ ${MAX_SWEEP_FSW_MULTIPLE} × plant.fsw (${formatEng(maxStop, 'Hz')})` });
		}
	});


/** A design document as written (defaults optional). */
export type DesignDocumentInput = z.input<typeof designDocumentSchema>;
/** A validated design document with defaults filled in. */
export type DesignDocument = z.output<typeof designDocumentSchema>;
export type SweepSpec = z.output<typeof sweepSchema>;
