/**
 * State-space realisation of a proper factored transfer function as a cascade of first- and
 * second-order sections, each in controllable canonical form in its own time scale σ = s/ω_s,
 * so every section's coefficients are O(1) however far apart the poles are (expanded
 * polynomials across 1 Hz–1 GHz would lose most digits; architecture note on representation).
 * Dense row-major matrices; x' = A·x + B·u, y = C·x + D·u.
 */
import { polyMul } from '../math/polynomial';
import { factorPoly } from '../tf/convert';
import type { FactoredTf, Root } from '../tf/types';

export interface StateSpace {
	/** n×n, row-major. */
	a: Float64Array;
	b: Float64Array;
	c: Float64Array;
	d: number;
	n: number;
}

interface Section {
	num: number[];
	den: number[];
}

const rootMag = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0);

/** Single section N/D (ascending, deg N ≤ deg D ≤ 2) in its own time scale. */
function sectionStateSpace(sec: Section): StateSpace {
	const n = sec.den.length - 1;
	const lead = sec.den[n];
	// Time scale: |a0/an|^(1/n); with an integrator |a1/a2|, or 1 rad/s for a bare one.
	const ws =
		sec.den[0] !== 0 ? Math.pow(Math.abs(sec.den[0] / lead), 1 / n) : n === 2 && sec.den[1] !== 0 ? Math.abs(sec.den[1] / lead) : 1;
	// In σ = s/ws: coefficient i multiplies ws^i.
	const alpha = sec.den.map((v, i) => (v * Math.pow(ws, i)) / (lead * Math.pow(ws, n)));
	const beta = new Array<number>(n + 1).fill(0);
	sec.num.forEach((v, i) => (beta[i] = (v * Math.pow(ws, i)) / (lead * Math.pow(ws, n))));
	const d = beta[n];
	if (n === 1) {
		return {
			n: 1,
			a: Float64Array.of(-alpha[0] * ws),
			b: Float64Array.of(ws),
			c: Float64Array.of(beta[0] - d * alpha[0]),
			d
		};
	}
	// x1' = x2, x2' = −α0·x1 − α1·x2 + u (in σ); y = (β0 − dα0)x1 + (β1 − dα1)x2 + d·u.
	return {
		n: 2,
		a: Float64Array.of(0, ws, -alpha[0] * ws, -alpha[1] * ws),
		b: Float64Array.of(0, ws),
		c: Float64Array.of(beta[0] - d * alpha[0], beta[1] - d * alpha[1]),
		d
	};
}

/** Series connection: u → s1 → s2. */
function series(s1: StateSpace, s2: StateSpace): StateSpace {
	const n = s1.n + s2.n;
	const a = new Float64Array(n * n);
	const b = new Float64Array(n);
	const c = new Float64Array(n);
	for (let i = 0; i < s1.n; i++) {
		for (let j = 0; j < s1.n; j++) a[i * n + j] = s1.a[i * s1.n + j];
		b[i] = s1.b[i];
		c[i] = s2.d * s1.c[i];
	}
	for (let i = 0; i < s2.n; i++) {
		const row = s1.n + i;
		for (let j = 0; j < s1.n; j++) a[row * n + j] = s2.b[i] * s1.c[j];
		for (let j = 0; j < s2.n; j++) a[row * n + s1.n + j] = s2.a[i * s2.n + j];
		b[row] = s2.b[i] * s1.d;
		c[s1.n + i] = s2.c[i];
	}
	return { n, a, b, c, d: s2.d * s1.d };
}

/**
 * Cascade realisation of tf (no delay; proper: numerator degree ≤ denominator degree).
 * Denominator sections: each pole pair, and real poles paired by magnitude (one may be left
 * single). Numerator pairs go to second-order sections first (always possible when proper),
 * then real and origin zeros fill the remaining capacity.
 */
export function realise(tf: FactoredTf): StateSpace {
	if (tf.delayS) throw new RangeError('realise: replace the delay by a Padé approximant first');
	const numFactors: number[][] = [];
	const denFactors: number[][] = [];
	for (let i = 0; i < tf.originPower; i++) numFactors.push([0, 1]);
	for (let i = 0; i < -tf.originPower; i++) denFactors.push([0, 1]);
	const numDeg = tf.zeros.reduce((a, r) => a + (r.kind === 'real' ? 1 : 2), Math.max(0, tf.originPower));
	const denDeg = tf.poles.reduce((a, r) => a + (r.kind === 'real' ? 1 : 2), Math.max(0, -tf.originPower));
	if (numDeg > denDeg) throw new RangeError(`realise: improper transfer function (numerator degree ${numDeg} > ${denDeg})`);
	if (denDeg === 0) return { n: 0, a: new Float64Array(0), b: new Float64Array(0), c: new Float64Array(0), d: tf.gain };

	// Denominator sections.
	const sections: { den: number[]; num: number[]; cap: number }[] = [];
	const realPoles = tf.poles.filter((r) => r.kind === 'real').sort((x, y) => rootMag(x) - rootMag(y));
	for (const p of tf.poles) if (p.kind === 'pair') sections.push({ den: factorPoly(p), num: [1], cap: 2 });
	const singles = [...denFactors, ...realPoles.map(factorPoly)];
	for (let i = 0; i + 1 < singles.length; i += 2) sections.push({ den: polyMul(singles[i], singles[i + 1]), num: [1], cap: 2 });
	if (singles.length % 2 === 1) sections.push({ den: singles[singles.length - 1], num: [1], cap: 1 });

	// Numerator factors: pairs first into capacity-2 sections.
	for (const z of tf.zeros) {
		if (z.kind !== 'pair') continue;
		const s = sections.find((x) => x.cap === 2);
		if (!s) throw new RangeError('realise: cannot place a complex zero pair');
		s.num = polyMul(s.num, factorPoly(z));
		s.cap = 0;
	}
	const realZeros = [...numFactors, ...tf.zeros.filter((r) => r.kind === 'real').map(factorPoly)];
	for (const z of realZeros) {
		const s = sections.find((x) => x.cap >= 1);
		if (!s) throw new RangeError('realise: cannot place a real zero');
		s.num = polyMul(s.num, z);
		s.cap -= 1;
	}

	let ss: StateSpace | null = null;
	for (const s of sections) {
		const part = sectionStateSpace(s);
		ss = ss ? series(ss, part) : part;
	}
	const out = ss as StateSpace;
	for (let i = 0; i < out.n; i++) out.c[i] *= tf.gain;
	out.d *= tf.gain;
	return out;
}
