/**
 * The verification targets of a design: the one definition of the margin targets and their
 * defaults, shared by the design document's `targets` section, the workspace settings
 * (src/lib/schemas/workspace.ts re-exports these) and the verdict (verify/).
 * Defaults [common practice]: PM ≥ 45°, GM ≥ 10 dB, crossover at most fsw/5.
 */
import { z } from 'zod';

const num = (unit: string) => z.number({ error: `must be a number (${unit})` }).finite({ error: `must be a finite number (${unit})` });

/** The three targets every workspace and rail carries. */
export const marginTargetsSchema = z.object({
	phaseMarginDeg: num('degrees').min(0, { error: 'must be ≥ 0°' }).max(120, { error: 'must be ≤ 120°' }),
	gainMarginDb: num('dB').min(0, { error: 'must be ≥ 0 dB' }).max(60, { error: 'must be ≤ 60 dB' }),
	maxCrossoverFraction: num('fraction of fsw').min(0.005, { error: 'must be ≥ 0.005' }).max(0.5, { error: 'must be ≤ 0.5 (fsw/2)' })
});
export type MarginTargets = z.infer<typeof marginTargetsSchema>;

export const DEFAULT_MARGIN_TARGETS: MarginTargets = { phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 };

const crossoverRangeSchema = z
	.object({
		min: num('Hz').positive({ error: 'must be > 0' }).optional(),
		max: num('Hz').positive({ error: 'must be > 0' }).optional()
	})
	.strict()
	.refine((r) => r.min === undefined || r.max === undefined || r.min <= r.max, { error: 'min must be ≤ max', path: ['min'] });

/** The design document's `targets` section: every field optional, defaults from DEFAULT_MARGIN_TARGETS. */
export const targetsSchema = z
	.object({
		phaseMarginDeg: marginTargetsSchema.shape.phaseMarginDeg.default(DEFAULT_MARGIN_TARGETS.phaseMarginDeg),
		gainMarginDb: marginTargetsSchema.shape.gainMarginDb.default(DEFAULT_MARGIN_TARGETS.gainMarginDb),
		maxCrossoverFraction: marginTargetsSchema.shape.maxCrossoverFraction.default(DEFAULT_MARGIN_TARGETS.maxCrossoverFraction),
		/** Allowed crossover range, Hz (a crossover outside it is a caution). */
		crossoverHz: crossoverRangeSchema.optional()
	})
	.strict();

export type Targets = z.output<typeof targetsSchema>;

/** The targets a document is verified against: its section, or the defaults when it has none. */
export function targetsOf(doc: { targets?: Targets }): Targets {
	return doc.targets ?? { ...DEFAULT_MARGIN_TARGETS };
}

/**
 * The spread's yield targets when its section names none: the document's targets, the crossover
 * bounded by the range and by maxCrossoverFraction·fsw, as the verdict judges it.
 */
export function spreadTargetsOf(t: Targets, fswHz: number): { phaseMarginDeg: number; gainMarginDb: number; crossoverHz: { min?: number; max: number } } {
	const max = Math.min(t.crossoverHz?.max ?? Infinity, t.maxCrossoverFraction * fswHz);
	return { phaseMarginDeg: t.phaseMarginDeg, gainMarginDb: t.gainMarginDb, crossoverHz: t.crossoverHz?.min !== undefined ? { min: t.crossoverHz.min, max } : { max } };
}
