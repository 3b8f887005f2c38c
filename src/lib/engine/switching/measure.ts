/**
 * Virtual loop-gain measurement on the switching model (docs/formulas.md §13.4): a sine of
 * frequency fsw/N is added between the output and the sensed node, so N switching periods hold
 * exactly one injection period and the injected converter is periodic again. Its orbit over N
 * periods is found by a chord iteration (Newton with the unperturbed monodromy to the power N as
 * the Jacobian), then one-bin Fourier integrals X (output) and Y (sensed node) over that orbit give
 * T = −X/Y. The integrals are exact per interval: from x' = A·x + B·e,
 *   ∫ x·e^(−jωt) dt = (A − jωI)⁻¹·([x·e^(−jωt)] − B·∫ e·e^(−jωt) dt)   [derived],
 * so no sampling and no aliasing of the ripple enters the result.
 */
import type { Complex } from '../math/complex';
import { switchedSystem, type SwitchingCircuitInput } from './circuit';
import { Propagator } from './cycle';
import { luFactor, luSolve, matMul, type Lu } from './linalg';
import { matrixPower, type PeriodicOrbit } from './steadyState';

export interface LoopGainPoint {
	/** The measured frequency fsw/N, Hz. */
	freqHz: number;
	/** Switching periods per injection period. */
	periods: number;
	/** Injection amplitude, V. */
	amplitude: number;
	t: Complex;
	magDb: number;
	/** Principal value, (−180°, 180°]. */
	phaseDeg: number;
	/** Chord iterations used and the last relative change of T. */
	iterations: number;
	residual: number;
}

/** The frequency the measurement can use near freqHz: fsw/N with N ≥ 2 whole periods. */
export function periodsFor(fswHz: number, freqHz: number): number {
	return Math.max(2, Math.round(fswHz / freqHz));
}

/** Fourier weights of one switch state: w solves (A − jωI)ᵀ·w = c_x; q = c_e − wᵀ·B. */
interface Weights {
	wr: Float64Array;
	wi: Float64Array;
	qr: Float64Array;
	qi: Float64Array;
}

function weights(a: Float64Array, vout: Float64Array, n: number, nc: number, omega: number): Weights {
	// Real form of (Aᵀ − jωI)(u + jv) = c: [Aᵀ  ωI; −ωI  Aᵀ]·[u; v] = [c; 0].
	const m = 2 * nc;
	const big = new Float64Array(m * m);
	for (let i = 0; i < nc; i++) {
		for (let j = 0; j < nc; j++) {
			const at = a[j * n + i];
			big[i * m + j] = at;
			big[(i + nc) * m + (j + nc)] = at;
		}
		big[i * m + (i + nc)] = omega;
		big[(i + nc) * m + i] = -omega;
	}
	const rhs = new Float64Array(m);
	for (let i = 0; i < nc; i++) rhs[i] = vout[i];
	const sol = luSolve(luFactor(big, m), rhs);
	const wr = sol.subarray(0, nc);
	const wi = sol.subarray(nc);
	const qr = new Float64Array(3);
	const qi = new Float64Array(3);
	for (let k = 0; k < 3; k++) {
		let br = 0;
		let bi = 0;
		for (let i = 0; i < nc; i++) {
			const b = a[i * n + nc + k];
			br += wr[i] * b;
			bi += wi[i] * b;
		}
		qr[k] = vout[nc + k] - br;
		qi[k] = -bi;
	}
	return { wr: Float64Array.from(wr), wi: Float64Array.from(wi), qr, qi };
}

/** ∫ v·e^(−jωt) dt over [t0, t1] for the output row of one switch state, from the end states. */
function intervalIntegral(w: Weights, nc: number, omega: number, t0: number, t1: number, x0: Float64Array, x1: Float64Array): [number, number] {
	const c0 = Math.cos(omega * t0);
	const s0 = -Math.sin(omega * t0);
	const c1 = Math.cos(omega * t1);
	const s1 = -Math.sin(omega * t1);
	// wᵀ·(x1·z1 − x0·z0), z = c + j·s.
	let re = 0;
	let im = 0;
	for (let i = 0; i < nc; i++) {
		const dr = x1[i] * c1 - x0[i] * c0;
		const di = x1[i] * s1 - x0[i] * s0;
		re += w.wr[i] * dr - w.wi[i] * di;
		im += w.wr[i] * di + w.wi[i] * dr;
	}
	// E = ∫ [1, sin ωt, cos ωt]·e^(−jωt) dt.
	const dt = t1 - t0;
	const e1r = -(s1 - s0) / omega;
	const e1i = (c1 - c0) / omega;
	const c20 = Math.cos(2 * omega * t0);
	const s20 = -Math.sin(2 * omega * t0);
	const c21 = Math.cos(2 * omega * t1);
	const s21 = -Math.sin(2 * omega * t1);
	// F2 = j·(z2(t1) − z2(t0))/(2ω)
	const f2r = -(s21 - s20) / (2 * omega);
	const f2i = (c21 - c20) / (2 * omega);
	const esr = -f2i / 2; // −(j/2)(dt − F2)
	const esi = -(dt - f2r) / 2;
	const ecr = (dt + f2r) / 2;
	const eci = f2i / 2;
	const er = [e1r, esr, ecr];
	const ei = [e1i, esi, eci];
	for (let k = 0; k < 3; k++) {
		re += w.qr[k] * er[k] - w.qi[k] * ei[k];
		im += w.qr[k] * ei[k] + w.qi[k] * er[k];
	}
	return [re, im];
}

export interface MeasureContext {
	circuit: SwitchingCircuitInput;
	orbit: PeriodicOrbit;
}

/** Cache of (M0^N − I) factorisations, per N, for one orbit. */
const chordCache = new WeakMap<PeriodicOrbit, Map<number, Lu>>();

function chordFactor(orbit: PeriodicOrbit, nc: number, periods: number): Lu {
	let perOrbit = chordCache.get(orbit);
	if (!perOrbit) chordCache.set(orbit, (perOrbit = new Map()));
	let lu = perOrbit.get(periods);
	if (!lu) {
		const m = matrixPower(orbit.monodromy, nc, periods, matMul);
		for (let i = 0; i < nc; i++) m[i * nc + i] -= 1;
		lu = luFactor(m, nc);
		perOrbit.set(periods, lu);
	}
	return lu;
}

/** T(j·2π·fsw/N) measured on the switching model with a sine of the given amplitude. */
export function measureLoopGain(ctx: MeasureContext, periods: number, amplitude: number): LoopGainPoint {
	const { circuit, orbit } = ctx;
	const omega = (2 * Math.PI * circuit.fswHz) / periods;
	const sys = switchedSystem(circuit, { omega, amplitude });
	const prop = new Propagator(sys, circuit.fswHz);
	const { n, nc } = sys;
	const wOn = weights(sys.aOn, sys.voutOn, n, nc, omega);
	const wOff = weights(sys.aOff, sys.voutOff, n, nc, omega);
	const lu = chordFactor(orbit, nc, periods);
	const x0 = Float64Array.from(orbit.x0);
	x0[sys.one] = 1;
	x0[sys.sin] = 0;
	x0[sys.cos] = 1;
	const ts = prop.ts;
	let t: Complex = { re: 0, im: 0 };
	let change = Infinity;
	let iterations = 0;
	for (; iterations < 10; iterations++) {
		let xr = 0;
		let xi = 0;
		let x: Float64Array = x0;
		for (let k = 0; k < periods; k++) {
			const r = prop.cycle(x);
			const start = k * ts;
			if (r.tOff > 0) {
				const [a, b] = intervalIntegral(wOn, nc, omega, start, start + r.tOff, x, r.xOff);
				xr += a;
				xi += b;
			}
			if (r.tOff < ts) {
				const [a, b] = intervalIntegral(wOff, nc, omega, start + r.tOff, start + ts, r.xOff, r.x1);
				xr += a;
				xi += b;
			}
			x = r.x1;
		}
		// Y = X + amplitude·∫ sin ωt·e^(−jωt) dt over the whole orbit = X − j·amplitude·N·Ts/2.
		const yr = xr;
		const yi = xi - (amplitude * periods * ts) / 2;
		const d = yr * yr + yi * yi;
		const next = { re: -(xr * yr + xi * yi) / d, im: -(xi * yr - xr * yi) / d };
		change = Math.hypot(next.re - t.re, next.im - t.im) / Math.max(Math.hypot(next.re, next.im), 1e-300);
		t = next;
		const f = new Float64Array(nc);
		for (let i = 0; i < nc; i++) f[i] = x[i] - x0[i];
		const delta = luSolve(lu, f);
		for (let i = 0; i < nc; i++) x0[i] -= delta[i];
		if (iterations >= 1 && change <= 1e-6) break;
	}
	const mag = Math.hypot(t.re, t.im);
	return {
		freqHz: circuit.fswHz / periods,
		periods,
		amplitude,
		t,
		magDb: 20 * Math.log10(mag),
		phaseDeg: (Math.atan2(t.im, t.re) * 180) / Math.PI,
		iterations: iterations + 1,
		residual: change
	};
}
