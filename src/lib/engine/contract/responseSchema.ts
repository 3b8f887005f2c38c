/**
 * zod schema of the analysis response, contract v1 (spec: design-document.md), extended with
 * the extra fields the engine reports. Every number is finite (z.number() rejects NaN and
 * ±Infinity); a margin that does not exist is null and its reason is in metrics.unavailable.
 */
import { z } from 'zod';
import { closedLoopSectionSchema, cornersSectionSchema, inputFilterSectionSchema, spreadSectionSchema } from './robustnessSchema';

const finite = z.number();
const nullableFinite = z.number().nullable();
const bode = z.object({ magDb: z.array(finite), phaseDeg: z.array(finite) });
const networkReport = z.object({
	parts: z.record(z.string(), finite),
	zerosHz: z.array(finite),
	polesHz: z.array(finite)
});
const warning = z.object({ code: z.string(), message: z.string() });

export const analysisResponseSchema = z.object({
	schemaVersion: z.literal(1),
	operatingPoint: z.object({
		duty: finite,
		efficiency: finite,
		rippleCurrent: finite,
		mode: z.enum(['ccm', 'dcm']),
		inductorCurrent: finite,
		loadResistance: finite,
		seriesResistance: finite,
		outputRipple: finite,
		outputRippleCapacitive: finite,
		outputRippleEsr: finite,
		criticalInductance: finite,
		criticalLoadResistance: finite,
		criticalLoadCurrent: finite,
		rampAmplitude: finite
	}),
	features: z.object({
		f0Hz: finite,
		q: finite,
		esrZeroHz: z.array(finite),
		rhpZeroHz: nullableFinite,
		selfResonanceHz: z.array(finite),
		/** Peak current mode only (plants/currentMode.ts): slopes in V/s at the comparator. */
		currentMode: z
			.object({
				sn: finite,
				sf: finite,
				se: finite,
				mc: finite,
				qp: nullableFinite,
				subharmonic: z.enum(['damped', 'peaking', 'unstable']),
				seForStability: finite,
				seForQpOne: finite,
				seHalfSf: finite,
				lowFrequencyPoleHz: finite
			})
			.optional()
	}),
	compensator: z.object({
		kind: z.string(),
		ideal: networkReport,
		rounded: networkReport.nullable(),
		placement: z.record(z.string(), z.union([z.string(), finite])).optional()
	}),
	response: z.object({
		freqHz: z.array(finite),
		plant: bode,
		compensator: bode,
		loop: bode
	}),
	metrics: z.object({
		crossoverHz: nullableFinite,
		phaseMarginDeg: nullableFinite,
		gainMarginDb: nullableFinite,
		phaseCrossoverHz: nullableFinite,
		delayMarginS: nullableFinite,
		gainReductionMarginDb: nullableFinite,
		modulusMargin: nullableFinite,
		modulusMarginHz: nullableFinite,
		crossovers: z.array(
			z.object({ freqHz: finite, phaseMarginDeg: finite, direction: z.enum(['falling', 'rising']) })
		),
		phaseCrossovers: z.array(
			z.object({ freqHz: finite, gainMarginDb: finite, direction: z.enum(['falling', 'rising']) })
		),
		closedLoopStable: z.boolean().nullable(),
		/** Closed-loop poles s/2π (Hz), from roots of 1 + T (delay as Padé(n,n)). */
		closedLoopPolesHz: z.array(z.object({ re: finite, im: finite })),
		padeOrder: finite,
		analysedRangeHz: z.object({ startHz: finite, stopHz: finite }),
		unavailable: z.record(z.string(), z.string())
	}),
	warnings: z.array(warning),
	/**
	 * Per capacitor branch, only when some branch has derating data: the typed value per part, the
	 * effective one every analysis uses, and its factors (DC bias at Vout, temperature at 25 °C, ageing).
	 */
	/** Loss estimate at the nominal point: 'conduction only' without part data (plants/losses.ts). */
	losses: z
		.object({
			basis: z.enum(['conduction only', 'conduction and part data']),
			items: z.record(z.string(), finite),
			total: finite,
			efficiency: finite
		})
		.optional(),
	capacitorDerating: z
		.array(z.object({ typed: finite, effective: finite, dcBias: finite, temperature: finite, ageing: finite }))
		.optional(),
	// Optional robustness sections (robustnessSchema.ts): closedLoop when the response is
	// included or the document has loadStep; the others when the document asks for them.
	closedLoop: closedLoopSectionSchema.optional(),
	corners: cornersSectionSchema.optional(),
	inputFilter: inputFilterSectionSchema.optional(),
	spread: spreadSectionSchema.optional()
});

export type AnalysisResponse = z.infer<typeof analysisResponseSchema>;
