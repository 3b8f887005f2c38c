/**
 * One switching period of the trailing-edge PWM, solved exactly: the switch turns on at the clock,
 * turns off at the first instant the comparator's margin reaches zero (voltage mode: the amplifier
 * output falls to the ramp, 0 → Vramp over Ts; peak current mode: the sensed current plus the ramp
 * Se rises to the amplifier output; comparator.ts) or at the maximum duty, and stays off until the
 * next clock. The on interval is walked on a grid of K exact steps e^(Ā·h) (precomputed) until the
 * margin changes sign; the instant is then placed inside that step by a safeguarded Newton
 * iteration on the exact solution (docs/formulas.md §13.2). A crossing and return within one grid
 * step (h = Ts/K) would be missed; that needs the margin to turn back up within h, steeper than
 * the ramp (voltage mode) or than the inductor's own rise (current mode), which the check reports
 * as outside its reach.
 */
import { expm } from '../timeresponse/expm';
import { identity, leadingBlock, matMul, matVec } from './linalg';
import type { SwitchedSystem } from './circuit';

/** Grid steps per period for the search of the turn-off instant. */
export const GRID_STEPS = 16;

interface Flow {
	a: Float64Array;
	/** e^(Ā·h) for the grid step. */
	step: Float64Array;
}

export interface CycleResult {
	/** State at the end of the period. */
	x1: Float64Array;
	/** Turn-off instant from the start of the period, s (0: never on; Ts: never off). */
	tOff: number;
	/** True when the clock ended the on interval (maximum duty, or on for the whole period), not the comparator. */
	forced: boolean;
	/** State at the turn-off instant. */
	xOff: Float64Array;
}

export class Propagator {
	readonly ts: number;
	readonly h: number;
	readonly on: Flow;
	readonly off: Flow;
	/** The comparator's ramp, V/s (docs/formulas.md §13.2). */
	readonly slope: number;
	/** Latest turn-off instant the clock allows, s. */
	readonly tMax: number;
	private readonly scale: number;

	constructor(
		readonly sys: SwitchedSystem,
		fswHz: number
	) {
		this.ts = 1 / fswHz;
		this.h = this.ts / GRID_STEPS;
		this.on = this.flow(sys.aOn);
		this.off = this.flow(sys.aOff);
		this.slope = sys.comparator.rampSlope;
		this.tMax = sys.comparator.maxDuty * this.ts;
		this.scale = sys.comparator.scale;
	}

	private flow(a: Float64Array): Flow {
		return { a, step: expm(a.map((v) => v * this.h), this.sys.n) };
	}

	/**
	 * e^(Ā·δ)·x with a fresh matrix exponential: the ESL of a branch against the load makes a pole
	 * near R/ESL (10¹¹ rad/s for 0.3 nH and 120 Ω), far too stiff for any series in δ, while the
	 * scaling-and-squaring of expm takes it in a few extra squarings.
	 */
	advance(f: Flow, delta: number, x: Float64Array): Float64Array {
		if (delta === 0) return Float64Array.from(x);
		return matVec(expm(f.a.map((v) => v * delta), this.sys.n), x, this.sys.n);
	}

	/** Comparator margin c·x − S·τ (comparator.ts); the switch stays on while it is positive. */
	margin(x: Float64Array, t: number): number {
		const c = this.sys.control;
		let s = 0;
		for (let i = 0; i < c.length; i++) s += c[i] * x[i];
		return s - this.slope * t;
	}

	/** d/dt of the margin along the on flow. */
	marginRate(x: Float64Array): number {
		const fx = matVec(this.on.a, x, this.sys.n);
		const c = this.sys.control;
		let s = 0;
		for (let i = 0; i < c.length; i++) s += c[i] * fx[i];
		return s - this.slope;
	}

	/** One period from x0 (augmented state at the clock). */
	cycle(x0: Float64Array): CycleResult {
		const n = this.sys.n;
		const K = GRID_STEPS;
		if (this.margin(x0, 0) <= 0 || this.tMax <= 0) return { x1: this.repeat(this.off.step, x0, K), tOff: 0, forced: this.margin(x0, 0) > 0, xOff: Float64Array.from(x0) };
		// Whole grid steps the clock allows; with a maximum duty off the grid, one partial step after them.
		const kMax = Math.min(K, Math.floor(this.tMax / this.h + 1e-9));
		let x = x0;
		let k = 0;
		let next = matVec(this.on.step, x, n);
		while (k < kMax && this.margin(next, (k + 1) * this.h) > 0) {
			x = next;
			k++;
			if (k < kMax) next = matVec(this.on.step, x, n);
		}
		if (k === K) return { x1: x, tOff: this.ts, forced: true, xOff: Float64Array.from(x) };
		let tr = (k + 1) * this.h;
		if (k === kMax) {
			// The margin is still positive at the last grid point the clock allows: the comparator
			// trips before tMax, or the clock ends the on interval there.
			tr = this.tMax;
			const xMax = this.advance(this.on, tr - k * this.h, x);
			if (tr <= k * this.h || this.margin(xMax, tr) > 0) return this.finishOff(xMax, tr, true, k);
		}
		const { t, xt } = this.placeTurnOff(x, k * this.h, tr);
		return this.finishOff(xt, t, false, k);
	}

	/** From the turn-off state at t (inside grid step k) to the end of the period. */
	private finishOff(xt: Float64Array, t: number, forced: boolean, k: number): CycleResult {
		const toGrid = this.advance(this.off, (k + 1) * this.h - t, xt);
		return { x1: this.repeat(this.off.step, toGrid, GRID_STEPS - k - 1), tOff: t, forced, xOff: xt };
	}

	private repeat(m: Float64Array, x: Float64Array, times: number): Float64Array {
		let y = x;
		for (let i = 0; i < times; i++) y = matVec(m, y, this.sys.n);
		return y;
	}

	/** The instant in (tl, tr] where the margin reaches zero, from the state xl at tl (margin > 0 there). */
	private placeTurnOff(xl: Float64Array, tl: number, tr: number): { t: number; xt: Float64Array } {
		let lo = tl;
		let hi = tr;
		// First candidate: the root of the cubic through the margin and its rate at both grid
		// points (one exact step is then usually enough).
		const span = tr - tl;
		const xr = span === this.h ? matVec(this.on.step, xl, this.sys.n) : this.advance(this.on, span, xl);
		const cand0 = hermiteRoot(this.margin(xl, tl), this.marginRate(xl) * span, this.margin(xr, tr), this.marginRate(xr) * span);
		let t = tl + cand0 * span;
		let xt = this.advance(this.on, t - tl, xl);
		let g = this.margin(xt, t);
		if (g > 0) lo = t;
		else hi = t;
		for (let it = 0; it < 60 && Math.abs(g) > 1e-14 * this.scale; it++) {
			const rate = this.marginRate(xt);
			let cand = rate < 0 ? t - g / rate : (lo + hi) / 2;
			if (!(cand > lo && cand < hi)) cand = (lo + hi) / 2;
			const xc = this.advance(this.on, cand - tl, xl);
			const gc = this.margin(xc, cand);
			const step = Math.abs(cand - t);
			t = cand;
			xt = xc;
			g = gc;
			if (gc > 0) lo = cand;
			else hi = cand;
			if (Math.abs(gc) <= 1e-14 * this.scale || step <= 1e-15 * this.ts || hi - lo <= 1e-15 * this.ts) break;
		}
		return { t, xt };
	}

	/**
	 * The cycle's Jacobian with respect to the circuit states (nc×nc): e^(Ā_off·(Ts − t))·S·e^(Ā_on·t),
	 * S the saltation matrix of the turn-off instant, I − (f_on − f_off)·cᵀ/(c·f_on − Vramp/Ts)
	 * [published: the saltation matrix of a state-dependent switching event, e.g. M. di Bernardo et
	 * al., Piecewise-smooth Dynamical Systems, Springer 2008, §2.5; from memory]. The clock edge
	 * is at a fixed time and adds no saltation.
	 */
	jacobian(r: CycleResult): Float64Array {
		const { n, nc } = this.sys;
		const scaled = (a: Float64Array, t: number) => expm(a.map((v) => v * t), n);
		if (r.tOff <= 0) return leadingBlock(scaled(this.off.a, this.ts), n, nc);
		if (r.tOff >= this.ts) return leadingBlock(scaled(this.on.a, this.ts), n, nc);
		if (r.forced) return leadingBlock(matMul(scaled(this.off.a, this.ts - r.tOff), scaled(this.on.a, r.tOff), n), n, nc);
		const fOn = matVec(this.on.a, r.xOff, n);
		const fOff = matVec(this.off.a, r.xOff, n);
		const c = this.sys.control;
		let den = -this.slope;
		for (let i = 0; i < n; i++) den += c[i] * fOn[i];
		const s = identity(n);
		for (let i = 0; i < n; i++) {
			const df = (fOn[i] - fOff[i]) / den;
			if (df === 0) continue;
			for (let j = 0; j < n; j++) s[i * n + j] -= df * c[j];
		}
		const m = matMul(scaled(this.off.a, this.ts - r.tOff), matMul(s, scaled(this.on.a, r.tOff), n), n);
		return leadingBlock(m, n, nc);
	}
}

/** The zero in (0, 1) of the cubic Hermite interpolant with values g0 > 0 ≥ g1 and slopes d0, d1 (per unit step). */
function hermiteRoot(g0: number, d0: number, g1: number, d1: number): number {
	const at = (u: number) => {
		const u2 = u * u;
		const u3 = u2 * u;
		return (2 * u3 - 3 * u2 + 1) * g0 + (u3 - 2 * u2 + u) * d0 + (-2 * u3 + 3 * u2) * g1 + (u3 - u2) * d1;
	};
	let lo = 0;
	let hi = 1;
	for (let i = 0; i < 50; i++) {
		const mid = (lo + hi) / 2;
		if (at(mid) > 0) lo = mid;
		else hi = mid;
	}
	return Math.min(Math.max((lo + hi) / 2, 1e-9), 1 - 1e-9);
}
