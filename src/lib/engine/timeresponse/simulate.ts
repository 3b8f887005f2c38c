/**
 * Exact discretisation of x' = A·x + B·u for inputs that are linear within each segment
 * (first-order hold, exact for ramps and steps): with the augmented state [x; u; u'],
 * exp(h·[[A, B, 0], [0, 0, 1], [0, 0, 0]]) = [[Φ, Γu, Γm], …], so
 * x[k+1] = Φ·x[k] + Γu·u[k] + Γm·u' — no integration error, only rounding (matrix
 * exponential: expm.ts, Padé 13 with scaling and squaring).
 */
import { expm } from './expm';
import type { StateSpace } from './realisation';

export interface InputSegment {
	/** Segment length, s. */
	durationS: number;
	/** Number of equal steps in the segment (≥ 1). */
	steps: number;
	/** du/dt within the segment. */
	slope: number;
}

export interface Waveform {
	timeS: number[];
	/** Output y(t). */
	value: number[];
	/** Input u(t) at the same instants. */
	input: number[];
}

interface Discrete {
	phi: Float64Array;
	gu: Float64Array;
	gm: Float64Array;
}

function discretise(ss: StateSpace, h: number): Discrete {
	const n = ss.n;
	const m = n + 2;
	const aug = new Float64Array(m * m);
	for (let i = 0; i < n; i++) {
		for (let j = 0; j < n; j++) aug[i * m + j] = ss.a[i * n + j] * h;
		aug[i * m + n] = ss.b[i] * h;
	}
	aug[n * m + n + 1] = h;
	const ex = expm(aug, m);
	const e = (i: number, j: number) => ex[i * m + j];
	const phi = new Float64Array(n * n);
	const gu = new Float64Array(n);
	const gm = new Float64Array(n);
	for (let i = 0; i < n; i++) {
		for (let j = 0; j < n; j++) phi[i * n + j] = e(i, j);
		gu[i] = e(i, n);
		// The last augmented state is u' itself, so its column gives the response to slope·1.
		gm[i] = e(i, n + 1);
	}
	for (const v of [...phi, ...gu, ...gm]) {
		if (!Number.isFinite(v)) throw new RangeError('simulate: the matrix exponential overflowed (unstable or too long a step)');
	}
	return { phi, gu, gm };
}

/**
 * Response from rest (x = 0) to an input that starts at u0 and then follows the segments.
 * Returns the samples at every step boundary, t = 0 included.
 */
export function simulatePiecewiseLinear(ss: StateSpace, u0: number, segments: readonly InputSegment[]): Waveform {
	const n = ss.n;
	let x = new Float64Array(n);
	let next = new Float64Array(n);
	let u = u0;
	let t = 0;
	const out = (xs: Float64Array, uu: number) => {
		let y = ss.d * uu;
		for (let i = 0; i < n; i++) y += ss.c[i] * xs[i];
		return y;
	};
	const timeS = [0];
	const value = [out(x, u)];
	const input = [u];
	const cache = new Map<number, Discrete>();
	for (const seg of segments) {
		if (!(seg.steps >= 1) || !(seg.durationS > 0)) throw new RangeError('simulate: a segment needs steps ≥ 1 and duration > 0');
		const h = seg.durationS / seg.steps;
		let dsc = cache.get(h);
		if (!dsc) {
			dsc = discretise(ss, h);
			cache.set(h, dsc);
		}
		const { phi, gu, gm } = dsc;
		const t0 = t;
		const u0s = u;
		for (let k = 1; k <= seg.steps; k++) {
			for (let i = 0; i < n; i++) {
				let acc = gu[i] * u + gm[i] * seg.slope;
				const row = i * n;
				for (let j = 0; j < n; j++) acc += phi[row + j] * x[j];
				next[i] = acc;
			}
			[x, next] = [next, x];
			// Recompute u and t from the segment start so rounding does not accumulate.
			u = u0s + seg.slope * h * k;
			t = t0 + h * k;
			timeS.push(t);
			value.push(out(x, u));
			input.push(u);
		}
	}
	return { timeS, value, input };
}
