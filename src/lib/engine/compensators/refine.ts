// Placement that survives its own verdict (DEVELOPERS.md, "Placement" under "Verdict rules"). The K-factor formulas place an ideal
// network on the nominal plant; two things then move the built loop off the request:
// - a finite op-amp (A0, GBW) adds lag and lowers the gain near fc, so the built loop crosses
//   elsewhere with less margin;
// - other operating points (Vin, Iout corners) see the same parts with another plant.
// refinePlacement re-places with a corrected request (a short fixed-point iteration on the
// built loop, op-amp model included) until the built loop meets fc and PM at the nominal point
// and, with placeFor 'worst-corner', the PM target at every operating case.
import { formatDeg } from '../../units/format';
import { loopMetrics } from '../analysis/margins';
import { multiply, type FactoredTf } from '../tf';
import type { NetworkParts } from '../synthesis/networks';
import type { Placement } from './placement';
import { compensatorTf, type OpampModel } from './transfer';

export interface RefineRequest {
	fcHz: number;
	pmDeg: number;
	/** Correct fc too (K-factor); false for methods that only target PM. */
	targetsFc: boolean;
	place: (fcHz: number, pmDeg: number) => Placement;
	partsOf: (p: Placement) => NetworkParts;
	plant: FactoredTf;
	opamp: OpampModel | null;
	/** Fm·Gvd at every other operating case (placeFor 'worst-corner'); empty = nominal only. */
	cornerPlants: FactoredTf[];
	rangeHz: { startHz: number; stopHz: number };
}

export interface RefineResult {
	placement: Placement;
	parts: NetworkParts;
	iterations: number;
	/** Built-loop figures after the last step (nominal), and the worst PM over the corners. */
	achieved: { fcHz: number | null; pmDeg: number | null; worstPmDeg: number | null };
	/** Why the target could not be met (null when it was). */
	shortfall: string | null;
}

/** Iteration limits [chosen: the corrections shrink by about 10× per step on the cases tried]. */
const MAX_STEPS = 8;
const FC_REL_TOL = 0.002;
const PM_TOL_DEG = 0.1;
/** Largest PM request: the K-factor boost limits stop it earlier for Type II/III. */
const MAX_PM_REQUEST = 89;

const metricsOf = (gc: FactoredTf, plant: FactoredTf, range: RefineRequest['rangeHz']) =>
	loopMetrics(multiply(gc, plant), range, { closedLoopPoles: false });

export function refinePlacement(r: RefineRequest): RefineResult {
	let fcReq = r.fcHz;
	let pmReq = r.pmDeg;
	let placement = r.place(fcReq, pmReq);
	let parts = r.partsOf(placement);
	let achieved: RefineResult['achieved'] = { fcHz: null, pmDeg: null, worstPmDeg: null };
	let shortfall: string | null = null;
	let steps = 0;
	for (; steps < MAX_STEPS; steps++) {
		const gc = compensatorTf(parts, r.opamp);
		const m = metricsOf(gc, r.plant, r.rangeHz);
		let worst = m.phaseMarginDeg;
		for (const p of r.cornerPlants) {
			const c = metricsOf(gc, p, r.rangeHz).phaseMarginDeg;
			if (c === null || worst === null) worst = null;
			else worst = Math.min(worst, c);
		}
		achieved = { fcHz: m.crossoverHz, pmDeg: m.phaseMarginDeg, worstPmDeg: worst };
		if (m.crossoverHz === null || m.phaseMarginDeg === null || worst === null) {
			shortfall = 'the built loop has no crossover at some operating case';
			break;
		}
		// Nominal: fc and PM as asked; corners: the worst PM at least the target.
		const fcErr = r.targetsFc ? m.crossoverHz / r.fcHz - 1 : 0;
		const pmErr = r.cornerPlants.length ? worst - r.pmDeg : m.phaseMarginDeg - r.pmDeg;
		const pmOk = r.cornerPlants.length ? pmErr >= -PM_TOL_DEG : Math.abs(pmErr) <= PM_TOL_DEG;
		if (Math.abs(fcErr) <= FC_REL_TOL && pmOk) {
			shortfall = null;
			break;
		}
		fcReq = r.targetsFc ? fcReq / (1 + fcErr) : fcReq;
		pmReq = Math.min(MAX_PM_REQUEST, pmReq - pmErr + (r.cornerPlants.length ? PM_TOL_DEG : 0));
		const next = r.place(fcReq, pmReq);
		// The K-factor limits cap the boost: a request it cannot deliver stops the iteration.
		if (next.kFactor && next.kFactor.usedBoostDeg < next.kFactor.requiredBoostDeg - 1e-9) {
			shortfall = `a ${r.cornerPlants.length ? 'worst-corner ' : ''}PM of ${formatDeg(r.pmDeg)} needs more phase boost than this network type gives`;
			placement = next;
			parts = r.partsOf(next);
			const gc2 = compensatorTf(parts, r.opamp);
			const m2 = metricsOf(gc2, r.plant, r.rangeHz);
			achieved = { fcHz: m2.crossoverHz, pmDeg: m2.phaseMarginDeg, worstPmDeg: achieved.worstPmDeg };
			steps++;
			break;
		}
		placement = next;
		parts = r.partsOf(next);
		shortfall = `not converged after ${MAX_STEPS} steps`;
	}
	return { placement, parts, iterations: steps, achieved, shortfall };
}

