/**
 * The periodic steady state of the switched converter, found directly by Newton's method on the
 * period map x ↦ P(x) (shooting: solve P(x) − x = 0 with the exact Jacobian, saltation included),
 * and its cycle-to-cycle stability from the Floquet multipliers, the eigenvalues of that Jacobian
 * at the orbit [published: T. J. Aprille and T. N. Trick, "Steady-state analysis of nonlinear
 * circuits with periodic inputs", Proc. IEEE 60(1), 1972 (shooting); from memory]
 * (docs/formulas.md §13.3).
 */
import { eigs } from 'mathjs';
import type { Complex } from '../math/complex';
import { identity, luFactor, luSolve } from './linalg';
import type { CycleResult, Propagator } from './cycle';

export interface PeriodicOrbit {
	/** Augmented state at the clock. */
	x0: Float64Array;
	cycle: CycleResult;
	/** Duty cycle of the orbit (turn-off instant over Ts). */
	duty: number;
	/** Jacobian of one period at the orbit (circuit states, nc×nc). */
	monodromy: Float64Array;
	multipliers: Complex[];
	/** Largest |multiplier|; below 1 the orbit is stable from cycle to cycle. */
	spectralRadius: number;
	/** Inductor current at its valley (the clock, where the on interval starts), A. */
	valleyCurrent: number;
	newtonSteps: number;
	converged: boolean;
}

/** Newton on the one-period map from the initial guess (circuit states; the exogenous ones set to 1, 0, 1). */
export function periodicSteadyState(prop: Propagator, guess: Float64Array): PeriodicOrbit {
	const { n, nc } = prop.sys;
	const x = Float64Array.from(guess);
	let cycle = prop.cycle(x);
	let steps = 0;
	let converged = false;
	for (; steps < 40; steps++) {
		const f = new Float64Array(nc);
		let size = 0;
		let worst = 0;
		for (let i = 0; i < nc; i++) {
			f[i] = cycle.x1[i] - x[i];
			size = Math.max(size, Math.abs(x[i]));
			worst = Math.max(worst, Math.abs(f[i]));
		}
		if (worst <= 1e-12 * Math.max(size, 1e-3)) {
			converged = true;
			break;
		}
		const j = prop.jacobian(cycle);
		for (let i = 0; i < nc; i++) j[i * nc + i] -= 1;
		const delta = luSolve(luFactor(j, nc), f);
		for (let i = 0; i < nc; i++) x[i] -= delta[i];
		cycle = prop.cycle(x);
	}
	const monodromy = prop.jacobian(cycle);
	const multipliers = eigenvalues(monodromy, nc);
	const spectralRadius = multipliers.reduce((m, z) => Math.max(m, Math.hypot(z.re, z.im)), 0);
	return {
		x0: x,
		cycle,
		duty: cycle.tOff / prop.ts,
		monodromy,
		multipliers,
		spectralRadius,
		valleyCurrent: x[prop.sys.iL],
		newtonSteps: steps,
		converged: converged && n > 0
	};
}

function eigenvalues(m: Float64Array, n: number): Complex[] {
	const rows: number[][] = [];
	for (let i = 0; i < n; i++) rows.push(Array.from(m.subarray(i * n, (i + 1) * n)));
	// mathjs's QR iteration may stop short of its tolerance on a well-conditioned matrix (a 5×5
	// monodromy of a 2 MHz buck at 1e-12); a looser tolerance still gives the multipliers to far
	// better than the 0.1 that separates the readings below.
	let res: { values: unknown } | null = null;
	for (const precision of [1e-12, 1e-10, 1e-8]) {
		try {
			res = eigs(rows, { eigenvectors: false, precision }) as unknown as { values: unknown };
			break;
		} catch {
			res = null;
		}
	}
	if (!res) throw new RangeError('the Floquet multipliers could not be computed (eigenvalue iteration did not converge)');
	const raw = res.values as { toArray?: () => unknown[] } | unknown[];
	const list = (Array.isArray(raw) ? raw : (raw.toArray?.() ?? [])) as unknown[];
	return list.map((v) => (typeof v === 'number' ? { re: v, im: 0 } : { re: (v as Complex).re, im: (v as Complex).im }));
}

/** M^k by repeated squaring (k ≥ 1). */
export function matrixPower(m: Float64Array, n: number, k: number, mul: (a: Float64Array, b: Float64Array, n: number) => Float64Array): Float64Array {
	let result = identity(n);
	let base = m;
	let e = k;
	while (e > 0) {
		if (e & 1) result = mul(result, base, n);
		e >>= 1;
		if (e) base = mul(base, base, n);
	}
	return result;
}

export type MultiplierReading = 'stable' | 'near-period-two' | 'period-two' | 'unstable';

/**
 * The multipliers in plain words: a real multiplier at or beyond −1 makes the switching alternate
 * from cycle to cycle (period two, subharmonic); one within 0.1 of −1 is close to it; any other
 * multiplier outside the unit circle is an unstable orbit.
 */
export function readMultipliers(multipliers: readonly Complex[]): MultiplierReading {
	let reading: MultiplierReading = 'stable';
	for (const z of multipliers) {
		const mag = Math.hypot(z.re, z.im);
		const realNegative = z.re < 0 && Math.abs(z.im) <= 1e-6 * Math.max(1, mag);
		if (realNegative && z.re <= -1) return 'period-two';
		if (mag >= 1) reading = 'unstable';
		else if (realNegative && z.re < -0.9 && reading === 'stable') reading = 'near-period-two';
	}
	return reading;
}
