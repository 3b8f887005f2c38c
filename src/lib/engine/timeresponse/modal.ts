/**
 * Modal (partial-fraction) solution of a proper rational G(s) = D + Σ r_i/(s − p_i) driven by
 * a step or a linear ramp, evaluated exactly at any instant [standard Laplace algebra]:
 *   unit step:  y(t) = D + Σ r_i·t·φ1(p_i·t),      φ1(z) = (e^z − 1)/z
 *   unit ramp:  y(t) = D·t + Σ r_i·t²·φ2(p_i·t),   φ2(z) = (e^z − 1 − z)/z²
 * φ1, φ2 by their series near z = 0, so slow poles lose no digits; fast poles simply decay,
 * so stiffness costs nothing. Residues r_i = k·Π(p_i − z)/Π_{j≠i}(p_i − p_j) need distinct
 * poles: `modalForm` reports the smallest relative pole separation so callers can fall back.
 */
import type { Complex } from '../math/complex';
import { factorRootsS } from '../tf/convert';
import type { FactoredTf } from '../tf/types';

export interface ModalForm {
	poles: Complex[];
	residues: Complex[];
	/** Direct term D = G(∞). */
	direct: number;
	/** min over pole pairs of |p_i − p_j| / max(|p_i|, |p_j|). */
	minSeparation: number;
}

const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const sub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
/**
 * a/b by Smith's algorithm: never forms |b|², which overflows once |b| passes 1e154 (a 16-pole
 * closed loop's pole differences multiply to that; the naive quotient then gave Inf/Inf = NaN).
 */
function div(a: Complex, b: Complex): Complex {
	if (Math.abs(b.re) >= Math.abs(b.im)) {
		const r = b.im / b.re;
		const d = b.re + b.im * r;
		return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
	}
	const r = b.re / b.im;
	const d = b.re * r + b.im;
	return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

/**
 * A complex product kept as mantissa·2^exponent: a residue of a bank with eight ESL branches is
 * a product of some forty factors spanning 1e3…1e11 rad/s, whose partial products leave the
 * double range although the residue itself is an ordinary number.
 */
class ScaledProduct {
	private v: Complex;
	private exp2 = 0;
	constructor(start: Complex) {
		this.v = start;
		this.renormalise();
	}
	times(c: Complex): this {
		this.v = mul(this.v, c);
		return this.renormalise();
	}
	over(c: Complex): this {
		this.v = div(this.v, c);
		return this.renormalise();
	}
	value(): Complex {
		// Two half-steps so 2^exp2 itself cannot overflow while the mantissa is small.
		const h = Math.trunc(this.exp2 / 2);
		const f = Math.pow(2, h) * Math.pow(2, this.exp2 - h);
		return { re: this.v.re * f, im: this.v.im * f };
	}
	private renormalise(): this {
		const m = Math.max(Math.abs(this.v.re), Math.abs(this.v.im));
		if (m === 0 || !Number.isFinite(m)) return this;
		const e = Math.floor(Math.log2(m));
		if (e > 64 || e < -64) {
			const f = Math.pow(2, -e); // exact: a power of two
			this.v = { re: this.v.re * f, im: this.v.im * f };
			this.exp2 += e;
		}
		return this;
	}
}

/**
 * Partial fractions of tf. `splitRelative` > 0 moves each pole that lies within that relative
 * distance of an earlier one by splitRelative·|p| (along its own direction), so a double pole
 * gets finite residues; the response then changes by about that relative amount.
 * Residues come from the normalised factors, G = gain·s^o·Π(1 − s/z)/Π(1 − s/p), so no
 * high-frequency gain k (a product of every root) is ever formed:
 *   r_i = gain·p_i^o·(−p_i)·Π(1 − p_i/z)/Π_{j≠i}(1 − p_i/p_j),
 *   D = G(∞) = gain·Π(−1/z)/Π(−1/p) when o + #zeros = #poles, else 0.
 */
export function modalForm(tf: FactoredTf, splitRelative = 0): ModalForm {
	if (tf.delayS) throw new RangeError('modal form: replace the delay by a Padé approximant first');
	if (tf.originPower < 0) throw new RangeError('modal form: a pole at the origin (no final value)');
	const zeros = tf.zeros.flatMap(factorRootsS);
	const exactPoles = tf.poles.flatMap(factorRootsS);
	const poles = splitRelative > 0 ? splitPoles(exactPoles, splitRelative) : exactPoles;
	if (zeros.length + tf.originPower > poles.length) throw new RangeError('modal form: improper transfer function');
	const one: Complex = { re: 1, im: 0 };
	let direct = 0;
	if (zeros.length + tf.originPower === poles.length) {
		const g = new ScaledProduct({ re: tf.gain, im: 0 });
		for (const z of zeros) g.over({ re: -z.re, im: -z.im });
		for (const p of poles) g.times({ re: -p.re, im: -p.im });
		direct = g.value().re;
	}
	let minSeparation = Infinity;
	const residues = poles.map((p, i) => {
		const r = new ScaledProduct({ re: tf.gain, im: 0 }).times({ re: -p.re, im: -p.im });
		for (let o = 0; o < tf.originPower; o++) r.times(p);
		// Interleave zero and pole factors so the partial products stay near 1.
		const others = poles.filter((_, j) => j !== i);
		const n = Math.max(zeros.length, others.length);
		for (let m = 0; m < n; m++) {
			if (m < zeros.length) r.times(sub(one, div(p, zeros[m])));
			if (m < others.length) {
				const q = others[m];
				const d = sub(p, q);
				const sep = Math.hypot(d.re, d.im) / Math.max(Math.hypot(p.re, p.im), Math.hypot(q.re, q.im));
				minSeparation = Math.min(minSeparation, sep);
				r.over(sub(one, div(p, q)));
			}
		}
		return r.value();
	});
	return { poles, residues, direct, minSeparation };
}

function splitPoles(poles: Complex[], rel: number): Complex[] {
	const out: Complex[] = [];
	for (const p of poles) {
		let q = p;
		for (let tries = 1; out.some((o) => Math.hypot(o.re - q.re, o.im - q.im) <= rel * Math.hypot(q.re, q.im)); tries++) {
			// Scale the magnitude (keeps conjugate pairs conjugate: both members move alike).
			q = { re: p.re * (1 + rel * tries * 1.5), im: p.im * (1 + rel * tries * 1.5) };
		}
		out.push(q);
	}
	return out;
}

/** φ1(z) = (e^z − 1)/z and φ2(z) = (e^z − 1 − z)/z² for complex z. */
export function phi12(z: Complex): { phi1: Complex; phi2: Complex } {
	const r = Math.hypot(z.re, z.im);
	if (r < 0.5) {
		// Series: φ1 = Σ z^k/(k+1)!, φ2 = Σ z^k/(k+2)!; 20 terms reach rounding for |z| < 0.5.
		let term: Complex = { re: 1, im: 0 };
		let p1: Complex = { re: 0, im: 0 };
		let p2: Complex = { re: 0, im: 0 };
		let fact1 = 1; // (k+1)!
		let fact2 = 2; // (k+2)!
		for (let kk = 0; kk < 20; kk++) {
			p1 = { re: p1.re + term.re / fact1, im: p1.im + term.im / fact1 };
			p2 = { re: p2.re + term.re / fact2, im: p2.im + term.im / fact2 };
			term = mul(term, z);
			fact1 *= kk + 2;
			fact2 *= kk + 3;
		}
		return { phi1: p1, phi2: p2 };
	}
	const ez = Math.exp(z.re);
	const em1: Complex = { re: ez * Math.cos(z.im) - 1, im: ez * Math.sin(z.im) };
	const phi1 = div(em1, z);
	const phi2 = div(sub(em1, z), mul(z, z));
	return { phi1, phi2 };
}

/** Unit-step and unit-ramp responses at time t ≥ 0 (t < 0 gives 0). */
export function modalAt(m: ModalForm, t: number): { step: number; ramp: number } {
	if (t <= 0) return { step: t === 0 ? m.direct : 0, ramp: 0 };
	let step = m.direct;
	let ramp = m.direct * t;
	for (let i = 0; i < m.poles.length; i++) {
		const p = m.poles[i];
		const { phi1, phi2 } = phi12({ re: p.re * t, im: p.im * t });
		const r = m.residues[i];
		// Conjugate pairs give conjugate terms; the real part of the sum is exact.
		step += t * (r.re * phi1.re - r.im * phi1.im);
		ramp += t * t * (r.re * phi2.re - r.im * phi2.im);
	}
	return { step, ramp };
}

/**
 * Response to an input that rises linearly from 0 to `amplitude` over riseTimeS (0 = ideal
 * step at t = 0) and then holds: y = (A/tr)·[ramp(t) − ramp(t − tr)].
 */
export function modalEdgeResponse(m: ModalForm, amplitude: number, riseTimeS: number, timeS: readonly number[]): number[] {
	return timeS.map((t) => {
		if (riseTimeS === 0) return t < 0 ? 0 : amplitude * modalAt(m, t).step;
		const slope = amplitude / riseTimeS;
		return slope * (modalAt(m, t).ramp - modalAt(m, t - riseTimeS).ramp);
	});
}
