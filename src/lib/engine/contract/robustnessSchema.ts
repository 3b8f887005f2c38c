/**
 * zod schemas of the analysis response's optional robustness sections (built by
 * closedloop/sections.ts): closedLoop, corners, inputFilter, spread. Every number finite
 * (z.number() rejects NaN and ±Infinity); a figure that does not exist is null. Magnitudes of
 * impedances are in dBΩ (20·log10 |Z| / 1 Ω), of ratios in dB; times in s, voltages in V.
 */
import { z } from 'zod';
import { PART_NAMES } from '../corners/variation';

const finite = z.number();
const nullableFinite = z.number().nullable();
const bode = z.object({ magDb: z.array(finite), phaseDeg: z.array(finite) });
const complexHz = z.object({ re: finite, im: finite });
const factors = z.partialRecord(z.enum(PART_NAMES), finite);

const stepFigures = z.object({
	initialValue: finite,
	finalValue: finite,
	peakValue: finite,
	peakTimeS: finite,
	peakDeviation: finite,
	overshoot: finite,
	overshootPct: finite,
	settlingBand: finite,
	settlingTimeS: nullableFinite,
	riseTimeS: nullableFinite
});

const transient = z.object({
	figures: stepFigures,
	/** ≤ 600 points; time from the step start (s), output deviation or output voltage (V). */
	waveform: z.object({ timeS: z.array(finite), value: z.array(finite) }),
	durationS: finite,
	step: finite
});

export const ruleOfThumbSchema = z.object({
	capacitiveV: finite,
	esrStepV: finite,
	generalV: finite,
	applies: z.boolean(),
	notes: z.array(z.object({ code: z.string(), message: z.string() }))
});

export const closedLoopSectionSchema = z.object({
	responses: z.object({
		freqHz: z.array(finite),
		/** Zo and Zo/(1 + T), dBΩ. */
		outputImpedanceOpen: bode,
		outputImpedanceClosed: bode,
		/** Gvg and Gvg/(1 + T). */
		lineToOutputOpen: bode,
		lineToOutputClosed: bode,
		/** (1/H)·T/(1 + T). */
		referenceToOutput: bode,
		/** 1/(1 + T) and T/(1 + T). */
		sensitivity: bode,
		complementarySensitivity: bode,
		sensitivityPeakDb: finite,
		sensitivityPeakHz: finite
	}),
	polesHz: z.array(complexHz),
	stable: z.boolean(),
	padeOrder: finite,
	loadStep: transient.extend({ riseTimeS: finite, ruleOfThumb: ruleOfThumbSchema.nullable() }).nullable(),
	referenceStep: transient.nullable()
});

const caseName = z.enum(['min', 'nom', 'max']);
const cornerPoint = z.object({
	vin: finite,
	iout: finite,
	vinCase: caseName,
	ioutCase: caseName,
	temperatureC: finite.optional(),
	tempCase: caseName.optional(),
	factors,
	kind: z.enum(['nominal', 'operating', 'exhaustive', 'one-at-a-time', 'linearised-worst']),
	label: z.string()
});
const cornerResult = cornerPoint.extend({
	crossoverHz: nullableFinite,
	phaseMarginDeg: nullableFinite,
	gainMarginDb: nullableFinite,
	closedLoopStable: z.boolean().nullable(),
	warnings: z.array(z.string()),
	error: z.string().nullable()
});
const worstCase = z.object({ value: finite, corner: cornerResult }).nullable();

export const cornersSectionSchema = z.object({
	mode: z.enum(['exhaustive', 'one-at-a-time']),
	corners: z.array(cornerResult),
	worst: z.object({ phaseMarginDeg: worstCase, gainMarginDb: worstCase, crossoverLowHz: worstCase, crossoverHighHz: worstCase }),
	unstableCorners: finite,
	failedCorners: finite,
	warningMessages: z.record(z.string(), z.string()),
	traces: z.array(z.object({ label: z.string(), corner: cornerPoint, magDb: z.array(finite), phaseDeg: z.array(finite) }))
});

const loopFigures = z.object({
	crossoverHz: nullableFinite,
	phaseMarginDeg: nullableFinite,
	gainMarginDb: nullableFinite,
	crossoverCount: finite,
	closedLoopStable: z.boolean().nullable()
});

export const inputFilterSectionSchema = z.object({
	r0: finite,
	f0Hz: finite,
	damping: z.object({ rd: finite, cd: finite }).nullable(),
	optimal: z.array(z.object({ n: finite, rd: finite, cd: finite, qOpt: finite, peakZs: finite })),
	peakZs: z.object({ value: finite, freqHz: finite }),
	/** |Zs|, |ZN|, |ZD| in dBΩ. */
	impedances: z.object({ freqHz: z.array(finite), zsDb: z.array(finite), znDb: z.array(finite), zdDb: z.array(finite) }),
	middlebrook: z.object({
		requiredDb: finite,
		marginNDb: finite,
		marginNHz: finite,
		marginDDb: finite,
		marginDHz: finite,
		pass: z.boolean()
	}),
	loopWithFilter: bode,
	withFilter: loopFigures,
	withoutFilter: loopFigures,
	verdict: z.object({ code: z.enum(['pass', 'marginal', 'fail']), message: z.string() })
});

const histogram = z.object({ edges: z.array(finite), counts: z.array(finite), scale: z.enum(['linear', 'log']), missing: finite });
const statistics = z.object({
	count: finite,
	missing: finite,
	min: nullableFinite,
	max: nullableFinite,
	mean: nullableFinite,
	std: nullableFinite,
	p1: nullableFinite,
	p5: nullableFinite,
	p50: nullableFinite,
	p95: nullableFinite,
	p99: nullableFinite
});

export const spreadSectionSchema = z.object({
	requested: finite,
	completed: finite,
	cancelled: z.boolean(),
	seed: finite,
	failures: finite,
	unstable: finite,
	yield: z.object({ all: finite, phaseMargin: nullableFinite, gainMargin: nullableFinite, crossover: nullableFinite, stable: finite }),
	histograms: z.object({ crossoverHz: histogram, phaseMarginDeg: histogram, gainMarginDb: histogram }),
	stats: z.object({ crossoverHz: statistics, phaseMarginDeg: statistics, gainMarginDb: statistics }),
	targets: z.object({
		phaseMarginDeg: finite.optional(),
		gainMarginDb: finite.optional(),
		crossoverHz: z.object({ min: finite.optional(), max: finite.optional() }).optional()
	})
});
