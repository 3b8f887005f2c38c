/**
 * The dense internal grid that brackets crossings (formulas §7.5): a log grid at a base
 * density, every corner frequency of the loop, extra points across each resonant pair
 * (|Q| > 1, spacing ∝ 1/Q around ω0), then adaptive bisection of any interval whose phase or
 * log-magnitude step is too large, so two crossings never share an interval in practice.
 * Values are the analytic ln|T| and unwrapped phase (rad) of the compiled loop.
 */
import { lnMagPhaseAt, type CompiledTf } from '../tf/evaluate';
import type { FactoredTf } from '../tf/types';

export interface GridOptions {
	/** Base density [12 points per decade; every corner frequency is added, and adaptive
	 * bisection keeps phase and magnitude steps small]. */
	pointsPerDecade?: number;
	/** Subdivide an interval whose phase changes by more than this (rad) [0.3 ≈ 17°]. */
	maxPhaseStep?: number;
	/** Subdivide an interval whose ln|T| changes by more than this [0.5 ≈ 4.3 dB]. */
	maxLnMagStep?: number;
	/** Maximum bisection depth per base interval [12]. */
	maxDepth?: number;
}

export interface SampledLoop {
	/** Number of valid samples. */
	n: number;
	/** Ascending angular frequencies, rad/s (first n entries valid). */
	omega: Float64Array;
	lnMag: Float64Array;
	phase: Float64Array;
}

export function sampleLoop(
	tf: FactoredTf,
	c: CompiledTf,
	omegaStart: number,
	omegaStop: number,
	options: GridOptions = {}
): SampledLoop {
	const ppd = options.pointsPerDecade ?? 12;
	const maxPh = options.maxPhaseStep ?? 0.3;
	const maxLn = options.maxLnMagStep ?? 0.5;
	const maxDepth = options.maxDepth ?? 12;

	const logA = Math.log(omegaStart);
	const logB = Math.log(omegaStop);
	const nBase = Math.max(2, Math.ceil((ppd * (logB - logA)) / Math.LN10) + 1);
	const base: number[] = new Array(nBase);
	const ratio = Math.exp((logB - logA) / (nBase - 1));
	base[0] = omegaStart;
	for (let i = 1; i < nBase; i++) base[i] = base[i - 1] * ratio;
	base[0] = omegaStart;
	base[nBase - 1] = omegaStop;
	let extra = false;
	const add = (w: number) => {
		if (w > omegaStart && w < omegaStop) {
			base.push(w);
			extra = true;
		}
	};
	for (const r of tf.zeros.concat(tf.poles)) {
		if (r.kind === 'real') {
			add(Math.abs(r.omega));
			continue;
		}
		add(r.omega0);
		const aq = Math.abs(r.q);
		if (!(aq > 1)) continue;
		// The phase of a pair turns by ~180° within ω0·(1 ± 1/|Q|).
		const width = Number.isFinite(aq) ? 1 / aq : 1e-9;
		for (let j = 1; j <= 4; j++) {
			add(r.omega0 * (1 + (j * width) / 2));
			add(r.omega0 / (1 + (j * width) / 2));
		}
	}
	if (extra) base.sort((a, b) => a - b);

	let cap = Math.max(64, base.length * 2);
	let omega = new Float64Array(cap);
	let lnMag = new Float64Array(cap);
	let phase = new Float64Array(cap);
	let n = 0;
	const push = (w: number, l: number, p: number) => {
		if (n === cap) {
			cap *= 2;
			const o2 = new Float64Array(cap);
			o2.set(omega);
			omega = o2;
			const l2 = new Float64Array(cap);
			l2.set(lnMag);
			lnMag = l2;
			const p2 = new Float64Array(cap);
			p2.set(phase);
			phase = p2;
		}
		omega[n] = w;
		lnMag[n] = l;
		phase[n] = p;
		n++;
	};
	const buf = new Float64Array(2);
	lnMagPhaseAt(c, base[0], buf);
	push(base[0], buf[0], buf[1]);
	// Explicit stack of pending right ends for the bisection: [omega, ln, phase, depth].
	const stack: number[] = [];
	for (let i = 1; i < base.length; i++) {
		const wb = base[i];
		if (!(wb > omega[n - 1])) continue;
		lnMagPhaseAt(c, wb, buf);
		stack.push(wb, buf[0], buf[1], 0);
		while (stack.length) {
			const top = stack.length - 4;
			const w2 = stack[top];
			const l2 = stack[top + 1];
			const p2 = stack[top + 2];
			const depth = stack[top + 3];
			const w1 = omega[n - 1];
			const l1 = lnMag[n - 1];
			const p1 = phase[n - 1];
			if (depth < maxDepth && (Math.abs(p2 - p1) > maxPh || Math.abs(l2 - l1) > maxLn)) {
				const wm = Math.sqrt(w1 * w2);
				lnMagPhaseAt(c, wm, buf);
				stack[top + 3] = depth + 1;
				stack.push(wm, buf[0], buf[1], depth + 1);
			} else {
				stack.length = top;
				push(w2, l2, p2);
			}
		}
	}
	return { n, omega, lnMag, phase };
}
