/**
 * The verification spec a rail gives a new revision: its operating ranges (`corners`), part
 * tolerances (`tolerances`), margin targets (`targets`) and Monte Carlo settings (`spread`), as
 * sections of the design document. `withRailSpec` fills only the sections a document lacks, so
 * a spec the engineer set on the design screen wins and a stored revision keeps its own spec
 * whatever the rail says later. Pure: the server applies it at save, the browser before its
 * live verdict, so both verify the same document.
 */
import type { PartName } from '../engine/corners/variation';

/** Relative tolerance per part with its Monte Carlo distribution (σ = tol/sigmas when normal). */
export interface PartToleranceSpec {
	tol: number;
	dist: 'uniform' | 'normal';
	sigmas: number;
}

/**
 * Usual tolerances of the parts a rail does not set itself [common practice: power inductors
 * ±20 %, ceramic banks ±20 %, ESR wide, DCR ±10 %, RDS(on) over temperature ±30 %, 1 % resistors,
 * 5 % C0G network capacitors, ramp ±5 %; peak current mode: the sense gain Ri ±10 % (sense resistor
 * and current-sense amplifier gain together), the compensation ramp Se ±20 %]. L and C are normal (3σ at the limit: a part's spread
 * inside its rating); the rest uniform in ±tol.
 */
export const DEFAULT_PART_TOLERANCES: Record<PartName, PartToleranceSpec> = {
	l: { tol: 0.2, dist: 'normal', sigmas: 3 },
	dcr: { tol: 0.1, dist: 'uniform', sigmas: 3 },
	rdsOn: { tol: 0.3, dist: 'uniform', sigmas: 3 },
	c: { tol: 0.2, dist: 'normal', sigmas: 3 },
	esr: { tol: 0.5, dist: 'uniform', sigmas: 3 },
	esl: { tol: 0.3, dist: 'uniform', sigmas: 3 },
	r1: { tol: 0.01, dist: 'uniform', sigmas: 3 },
	r2: { tol: 0.01, dist: 'uniform', sigmas: 3 },
	r3: { tol: 0.01, dist: 'uniform', sigmas: 3 },
	c1: { tol: 0.05, dist: 'uniform', sigmas: 3 },
	c2: { tol: 0.05, dist: 'uniform', sigmas: 3 },
	c3: { tol: 0.05, dist: 'uniform', sigmas: 3 },
	gm: { tol: 0.2, dist: 'uniform', sigmas: 3 },
	ro: { tol: 0.2, dist: 'uniform', sigmas: 3 },
	vramp: { tol: 0.05, dist: 'uniform', sigmas: 3 },
	senseGain: { tol: 0.1, dist: 'uniform', sigmas: 3 },
	rampSlope: { tol: 0.2, dist: 'uniform', sigmas: 3 }
};

/**
 * Monte Carlo settings of a rail's revisions: 500 samples resolve a yield to 0.2 % (enough to
 * tell 100 % from the 90 % fail line) and keep a save near a second on one core; seed 1 so a
 * stored verdict reproduces exactly.
 */
export const RAIL_SPREAD = { samples: 500, seed: 1, bins: 40 } as const;

/** What a rail holds that a revision's spec starts from (the rail row, with its targets in force). */
export interface RailSpecSource {
	vinMin: number;
	vinMax: number;
	ioutMin: number;
	ioutMax: number;
	/** Percent (±) of the power-stage parts; `vrefPct` sets DC accuracy only and is no loop part. */
	tolerances: { inductorPct: number; capacitorPct: number; esrPct: number; vrefPct?: number };
	/** The rail's targets, or its workspace's when the rail has none. */
	targets: { phaseMarginDeg: number; gainMarginDb: number; maxCrossoverFraction: number; crossoverHz?: { min?: number; max?: number } };
}

const pct = (x: number) => Math.min(0.9, Math.max(0, x / 100));

/** The spec sections a rail gives (every part toleranced; parts a loop lacks are ignored by the engine). */
export function railSpecSections(rail: RailSpecSource) {
	const tolerances: Record<string, PartToleranceSpec> = { ...DEFAULT_PART_TOLERANCES };
	tolerances.l = { ...tolerances.l, tol: pct(rail.tolerances.inductorPct) };
	tolerances.c = { ...tolerances.c, tol: pct(rail.tolerances.capacitorPct) };
	tolerances.esr = { ...tolerances.esr, tol: pct(rail.tolerances.esrPct) };
	const t = rail.targets;
	return {
		targets: {
			phaseMarginDeg: t.phaseMarginDeg,
			gainMarginDb: t.gainMarginDb,
			maxCrossoverFraction: t.maxCrossoverFraction,
			...(t.crossoverHz ? { crossoverHz: { ...t.crossoverHz } } : {})
		},
		corners: { vin: { min: rail.vinMin, max: rail.vinMax }, iout: { min: rail.ioutMin, max: rail.ioutMax } },
		tolerances,
		spread: { ...RAIL_SPREAD }
	};
}

export const SPEC_SECTIONS = ['targets', 'corners', 'tolerances', 'spread'] as const;

/**
 * The document with every missing spec section taken from the rail. A section the document
 * has is kept whole (the engineer's choice); the nominal stays `plant.vin` / `plant.iout`.
 */
export function withRailSpec<T extends Record<string, unknown>>(doc: T, rail: RailSpecSource): T & ReturnType<typeof railSpecSections> {
	const spec = railSpecSections(rail);
	const out: Record<string, unknown> = { ...doc };
	for (const key of SPEC_SECTIONS) if (out[key] === undefined || out[key] === null) out[key] = spec[key];
	return out as T & ReturnType<typeof railSpecSections>;
}
