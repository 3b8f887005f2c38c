/**
 * A load-current step on the switching model (docs/formulas.md §13.6): from the periodic steady
 * state (orbitOf), the load draws ΔI more from the clock edge at t = 0 on, and the switched
 * circuit is run period by period with the comparator deciding every turn-off instant, exactly
 * as in the check. The output is read at every clock edge (once per period, so the ripple does not
 * enter), relative to its value on the steady orbit at the same instant: the deviation the
 * averaged model's load step (closedloop/, −Zo,cl·ΔI) shows as a smooth curve.
 */
import { dot } from './linalg';
import { switchedSystem } from './circuit';
import { Propagator } from './cycle';
import { orbitOf, type SwitchingCheckInput } from './check';

export interface SwitchingLoadStep {
	/** Load-current step, A (positive: more load). */
	stepA: number;
	/** Clock edges after the step, s (0 is the step). */
	timeS: number[];
	/** Output voltage at each clock edge minus its value on the steady orbit, V. */
	deviationV: number[];
	/** Largest |deviation|, V, and when. */
	peakV: number;
	peakTimeS: number;
}

/** At most this many periods (the engine's bound on one run). */
export const MAX_STEP_PERIODS = 20_000;

export function switchingLoadStep(input: SwitchingCheckInput, stepA: number, durationS: number): SwitchingLoadStep | { reason: string } {
	if (!(Number.isFinite(stepA) && stepA !== 0)) return { reason: 'The load step must be a finite current other than 0 A.' };
	const c = input.circuit;
	const periods = Math.min(MAX_STEP_PERIODS, Math.max(1, Math.ceil(durationS * c.fswHz)));
	let found: ReturnType<typeof orbitOf>;
	try {
		found = orbitOf(input);
	} catch (error) {
		return { reason: `The switching model could not be solved for this design (${error instanceof Error ? error.message : String(error)}).` };
	}
	const { orbit, prop } = found;
	if (!orbit.converged) return { reason: 'The switching model found no periodic steady state, so there is nothing to step from.' };
	const sys = switchedSystem(c, { omega: 0, amplitude: 0, loadStep: stepA });
	const stepped = new Propagator(sys, c.fswHz);
	// The clock-edge value closes the interval that just ended: off, unless on for the whole period.
	const edgeRow = (s: typeof sys, tOff: number) => (tOff < prop.ts ? s.voutOff : s.voutOn);
	const before = dot(edgeRow(prop.sys, orbit.cycle.tOff), orbit.x0);
	const timeS = [0];
	const deviationV = [0];
	let x: Float64Array = Float64Array.from(orbit.x0);
	let peakV = 0;
	let peakTimeS = 0;
	for (let k = 1; k <= periods; k++) {
		const r = stepped.cycle(x);
		x = r.x1;
		const v = dot(edgeRow(sys, r.tOff), x) - before;
		if (!Number.isFinite(v)) return { reason: 'The switching model diverged after the load step.' };
		timeS.push(k * prop.ts);
		deviationV.push(v);
		if (Math.abs(v) > Math.abs(peakV)) {
			peakV = v;
			peakTimeS = k * prop.ts;
		}
	}
	return { stepA, timeS, deviationV, peakV, peakTimeS };
}
