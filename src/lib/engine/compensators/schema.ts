// zod schema of the design document's `compensator` section (contract v1, spec/design-document.md).
// SI units; frequencies in Hz; parts in Ω, F, S. Messages name the rule; zod adds the field path.
// The contract module imports `compensatorSchema` into the whole-document schema.
import { z } from 'zod';
import { E_SERIES_NAMES } from '../synthesis/eSeries';
import { COMPENSATOR_KINDS, type CompensatorKind } from '../synthesis/networks';

const positive = (unit: string) => z.number({ error: `must be a number (${unit})` }).positive({ error: 'must be > 0' });
const frequency = () => positive('Hz');

export const compensatorKindSchema = z.enum(COMPENSATOR_KINDS, { error: `must be one of ${COMPENSATOR_KINDS.join(', ')}` });

export const eSeriesNameSchema = z.enum(E_SERIES_NAMES, { error: `must be one of ${E_SERIES_NAMES.join(', ')} or null` });

/** Network parts (R1 lives in `feedback.r1`, Rb follows from `feedback.vref`). Which are required depends on kind. */
export const compensatorPartsSchema = z.object({
	r2: positive('Ω').optional(),
	r3: positive('Ω').optional(),
	c1: positive('F').optional(),
	c2: positive('F').optional(),
	c3: positive('F').optional(),
	/** OTA transconductance, S (type2-ota only). */
	gm: positive('S').optional(),
	/** OTA output resistance, Ω (type2-ota only; absent = ideal current source). */
	ro: positive('Ω').optional()
});

export const REQUIRED_PARTS: Record<CompensatorKind, readonly string[]> = {
	type1: ['c1'],
	type2: ['r2', 'c1', 'c2'],
	type3: ['r2', 'r3', 'c1', 'c2', 'c3'],
	'type2-ota': ['gm', 'r2', 'c1', 'c2']
};

/** How many finite zeros/poles each kind has (manual placement). */
export const CORNER_COUNT: Record<CompensatorKind, number> = {
	type1: 0,
	type2: 1,
	type3: 2,
	'type2-ota': 1
};

export const compensatorTargetSchema = z.object({
	method: z.enum(['k-factor', 'features', 'manual'], { error: 'must be k-factor, features or manual' }),
	crossoverHz: frequency().optional(),
	phaseMarginDeg: z
		.number({ error: 'must be a number (degrees)' })
		.gt(0, { error: 'must be > 0°' })
		.lt(180, { error: 'must be < 180°' })
		.optional(),
	/** Manual: finite poles (the integrator at the origin is implied). */
	polesHz: z.array(frequency()).optional(),
	/** Manual: finite zeros. */
	zerosHz: z.array(frequency()).optional(),
	/** Manual alternative to crossoverHz: flat gain ωI/ωz (Type II) or ωI/ωz1 (Type III), dB. */
	midbandGainDb: z.number({ error: 'must be a number (dB)' }).optional(),
	/** Features: zeros as multiples of the LC resonance f0 (default [1] or [1, 1]). */
	zerosRelF0: z.array(positive('× f0')).optional(),
	/** Features: poles as fractions of fsw, replacing the defaults (ESR zero, fsw/2). */
	polesRelFsw: z.array(positive('× fsw')).optional(),
	/**
	 * K-factor: where the phase-margin target must hold. 'nominal' places for the nominal operating
	 * point; 'worst-corner' raises the boost until the built parts meet the target at every
	 * operating case of the document's corners (or says why they cannot). Absent = 'nominal'.
	 */
	placeFor: z.enum(['nominal', 'worst-corner'], { error: 'must be "nominal" or "worst-corner"' }).optional()
});

export const compensatorSeriesSchema = z.object({
	resistors: eSeriesNameSchema.nullable(),
	capacitors: eSeriesNameSchema.nullable()
});

export const opampSchema = z.object({
	a0Db: z.number({ error: 'must be a number (dB)' }).positive({ error: 'must be > 0 dB' }),
	gbw: positive('Hz')
});

export const compensatorSchema = z
	.object({
		kind: compensatorKindSchema,
		parts: compensatorPartsSchema.optional(),
		target: compensatorTargetSchema.optional(),
		/** Absent: E96 resistors, E12 capacitors. null: no rounding. */
		series: compensatorSeriesSchema.nullable().optional(),
		opamp: opampSchema.optional()
	})
	.superRefine((c, ctx) => {
		if (!c.parts && !c.target) {
			ctx.addIssue({ code: 'custom', path: ['parts'], message: 'give parts or a target (or both)' });
		}
		const network = hasNetworkParts(c.parts);
		if (c.parts && (network || !c.target)) {
			for (const name of REQUIRED_PARTS[c.kind]) {
				if ((c.parts as Record<string, unknown>)[name] === undefined) {
					ctx.addIssue({ code: 'custom', path: ['parts', name], message: `is required for ${c.kind}` });
				}
			}
		}
		if (c.kind === 'type2-ota' && c.opamp) {
			ctx.addIssue({ code: 'custom', path: ['opamp'], message: 'applies to op-amp kinds; a type2-ota uses parts.gm and parts.ro' });
		}
		if (c.kind === 'type2-ota' && c.target && !c.parts?.gm) {
			ctx.addIssue({ code: 'custom', path: ['parts', 'gm'], message: 'is required to place a type2-ota (the amplifier gm)' });
		}
		const t = c.target;
		if (!t || network) return; // with network parts present the target is only the goal; no placement inputs needed
		if (t.method === 'k-factor') {
			if (t.crossoverHz === undefined) ctx.addIssue({ code: 'custom', path: ['target', 'crossoverHz'], message: 'is required for k-factor' });
			if (t.phaseMarginDeg === undefined) {
				ctx.addIssue({ code: 'custom', path: ['target', 'phaseMarginDeg'], message: 'is required for k-factor' });
			}
		}
		if (t.method === 'features' && t.crossoverHz === undefined) {
			ctx.addIssue({ code: 'custom', path: ['target', 'crossoverHz'], message: 'is required for features placement' });
		}
		if (t.method === 'manual') {
			const n = CORNER_COUNT[c.kind];
			for (const key of ['zerosHz', 'polesHz'] as const) {
				const list = t[key] ?? [];
				if (list.length !== n) {
					ctx.addIssue({ code: 'custom', path: ['target', key], message: `must list ${n} frequencies for ${c.kind}` });
				}
			}
			const hasFc = t.crossoverHz !== undefined;
			const hasMid = t.midbandGainDb !== undefined;
			if (!hasFc && !hasMid) {
				ctx.addIssue({ code: 'custom', path: ['target', 'crossoverHz'], message: 'give crossoverHz or midbandGainDb for manual placement' });
			}
			if (hasMid && c.kind === 'type1') {
				ctx.addIssue({ code: 'custom', path: ['target', 'midbandGainDb'], message: 'a Type I has no mid-band; give crossoverHz' });
			}
		}
	});

/** True when the parts describe the network itself (not only the OTA's gm/ro); such parts win over a target. */
export function hasNetworkParts(parts: { r2?: number; r3?: number; c1?: number; c2?: number; c3?: number } | undefined): boolean {
	return !!parts && [parts.r2, parts.r3, parts.c1, parts.c2, parts.c3].some((v) => v !== undefined);
}

export type CompensatorDoc = z.infer<typeof compensatorSchema>;
export type CompensatorTarget = z.infer<typeof compensatorTargetSchema>;
