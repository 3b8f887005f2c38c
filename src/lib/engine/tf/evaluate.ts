/**
 * Evaluates factored transfer functions at s = jω. Magnitude is a sum of log-magnitudes and
 * the phase a sum of factor phases, so the phase is unwrapped by construction (docs/formulas.md §7.6):
 * real factor (1 + jω/ω1) → atan(ω/ω1) (negative for RHP); pair → atan2(ω/(qω0), 1 − ω²/ω0²),
 * which runs 0 → ±180° continuously; s^n → n·90°; negative gain → +180°; delay → −ω·Td exactly.
 */
import type { Complex } from '../math/complex';
import type { FactoredTf } from './types';

const LN10_OVER_20 = Math.LN10 / 20;
const RAD2DEG = 180 / Math.PI;

/** A transfer function flattened into typed arrays for fast repeated evaluation. */
export interface CompiledTf {
	lnAbsGain: number;
	/** Constant phase: 180° for a negative gain, in rad. */
	phase0: number;
	originPower: number;
	delayS: number;
	/** Reciprocal corner 1/ω of real zeros and poles (sign kept: negative = RHP). */
	zReal: Float64Array;
	pReal: Float64Array;
	/** Pairs: 1/ω0 and 1/q (1/q = 0 for an undamped pair). */
	zPairInvW: Float64Array;
	zPairInvQ: Float64Array;
	pPairInvW: Float64Array;
	pPairInvQ: Float64Array;
}

export function compileTf(tf: FactoredTf): CompiledTf {
	const z = splitRoots(tf.zeros);
	const p = splitRoots(tf.poles);
	return {
		lnAbsGain: Math.log(Math.abs(tf.gain)),
		phase0: tf.gain < 0 ? Math.PI : 0,
		originPower: tf.originPower,
		delayS: tf.delayS ?? 0,
		zReal: z.real,
		pReal: p.real,
		zPairInvW: z.invW,
		zPairInvQ: z.invQ,
		pPairInvW: p.invW,
		pPairInvQ: p.invQ
	};
}

/** Reciprocal corners of a factor list, filled straight into typed arrays (Float64Array.from is slow). */
function splitRoots(roots: FactoredTf['zeros']): { real: Float64Array; invW: Float64Array; invQ: Float64Array } {
	let nReal = 0;
	for (const r of roots) if (r.kind === 'real') nReal++;
	const real = new Float64Array(nReal);
	const invW = new Float64Array(roots.length - nReal);
	const invQ = new Float64Array(roots.length - nReal);
	let i = 0;
	let j = 0;
	for (const r of roots) {
		if (r.kind === 'real') real[i++] = 1 / r.omega;
		else {
			invW[j] = 1 / r.omega0;
			invQ[j++] = Number.isFinite(r.q) ? 1 / r.q : 0;
		}
	}
	return { real, invW, invQ };
}

/** ln|T(jω)| and the unwrapped phase in rad, written into out[0], out[1] (`logOmega`: ln ω, if known). */
export function lnMagPhaseAt(c: CompiledTf, omega: number, out: Float64Array, logOmega = Math.log(omega)): void {
	let ln = c.lnAbsGain + c.originPower * logOmega;
	let ph = c.phase0 + c.originPower * (Math.PI / 2) - omega * c.delayS;
	// Running product of squared magnitudes; folded into ln when it leaves a safe range.
	let prod = 1;
	// Real factors two at a time: arg((1 + jx1)(1 + jx2)) = atan2(x1 + x2, 1 − x1·x2) exactly,
	// because each term lies in (−90°, 90°), so their sum lies in (−180°, 180°): one atan2, no wrap.
	const zr = c.zReal;
	let i = 0;
	for (; i + 1 < zr.length; i += 2) {
		const x1 = omega * zr[i];
		const x2 = omega * zr[i + 1];
		prod *= (1 + x1 * x1) * (1 + x2 * x2);
		ph += Math.atan2(x1 + x2, 1 - x1 * x2);
		if (prod > 1e200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
	}
	if (i < zr.length) {
		const x = omega * zr[i];
		prod *= 1 + x * x;
		ph += Math.atan(x);
	}
	const pr = c.pReal;
	for (i = 0; i + 1 < pr.length; i += 2) {
		const x1 = omega * pr[i];
		const x2 = omega * pr[i + 1];
		prod /= (1 + x1 * x1) * (1 + x2 * x2);
		ph -= Math.atan2(x1 + x2, 1 - x1 * x2);
		if (prod > 1e200 || prod < 1e-200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
	}
	if (i < pr.length) {
		const x = omega * pr[i];
		prod /= 1 + x * x;
		ph -= Math.atan(x);
	}
	const zw = c.zPairInvW;
	const zq = c.zPairInvQ;
	for (i = 0; i < zw.length; i++) {
		const x = omega * zw[i];
		const re = 1 - x * x;
		const im = x * zq[i];
		prod *= re * re + im * im;
		ph += Math.atan2(im, re);
		if (prod > 1e200 || prod < 1e-200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
	}
	const pw = c.pPairInvW;
	const pq = c.pPairInvQ;
	for (i = 0; i < pw.length; i++) {
		const x = omega * pw[i];
		const re = 1 - x * x;
		const im = x * pq[i];
		prod /= re * re + im * im;
		ph -= Math.atan2(im, re);
		if (prod > 1e200 || prod < 1e-200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
	}
	out[0] = ln + 0.5 * Math.log(prod);
	out[1] = ph;
}

/**
 * lnMagPhaseAt plus the slopes in log frequency: out = [ln|T|, phase (rad), d ln|T|/d ln ω,
 * d phase/d ln ω]. ln|T| and the phase come out bit-identical to lnMagPhaseAt (same operations
 * in the same order), so brackets found with one hold for the other. Per factor, with x = ω/ωc:
 * real (1 + jx): slopes x²/(1 + x²) and x/(1 + x²) (x < 0 for a RHP root); pair
 * 1 − x² + jx/q: slopes x²(1/q² − 2(1 − x²))/D and (x/q)(1 + x²)/D, D = (1 − x²)² + x²/q²;
 * s^n: n and 0; delay: 0 and −ωTd [derived here: d/d ln ω = ω·d/dω]. `logOmega` saves the log
 * when the caller already has ln ω.
 */
export function lnMagPhaseSlopeAt(c: CompiledTf, omega: number, out: Float64Array | number[], logOmega = Math.log(omega)): void {
	let ln = c.lnAbsGain + c.originPower * logOmega;
	let ph = c.phase0 + c.originPower * (Math.PI / 2) - omega * c.delayS;
	let sm = c.originPower;
	let sp = -omega * c.delayS;
	let prod = 1;
	const zr = c.zReal;
	let i = 0;
	for (; i + 1 < zr.length; i += 2) {
		const x1 = omega * zr[i];
		const x2 = omega * zr[i + 1];
		const d1 = 1 + x1 * x1;
		const d2 = 1 + x2 * x2;
		prod *= d1 * d2;
		ph += Math.atan2(x1 + x2, 1 - x1 * x2);
		if (prod > 1e200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
		sm += (x1 * x1) / d1 + (x2 * x2) / d2;
		sp += x1 / d1 + x2 / d2;
	}
	if (i < zr.length) {
		const x = omega * zr[i];
		const d = 1 + x * x;
		prod *= d;
		ph += Math.atan(x);
		sm += (x * x) / d;
		sp += x / d;
	}
	const pr = c.pReal;
	for (i = 0; i + 1 < pr.length; i += 2) {
		const x1 = omega * pr[i];
		const x2 = omega * pr[i + 1];
		const d1 = 1 + x1 * x1;
		const d2 = 1 + x2 * x2;
		prod /= d1 * d2;
		ph -= Math.atan2(x1 + x2, 1 - x1 * x2);
		if (prod > 1e200 || prod < 1e-200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
		sm -= (x1 * x1) / d1 + (x2 * x2) / d2;
		sp -= x1 / d1 + x2 / d2;
	}
	if (i < pr.length) {
		const x = omega * pr[i];
		const d = 1 + x * x;
		prod /= d;
		ph -= Math.atan(x);
		sm -= (x * x) / d;
		sp -= x / d;
	}
	const zw = c.zPairInvW;
	const zq = c.zPairInvQ;
	for (i = 0; i < zw.length; i++) {
		const x = omega * zw[i];
		const re = 1 - x * x;
		const im = x * zq[i];
		const d = re * re + im * im;
		prod *= d;
		ph += Math.atan2(im, re);
		if (prod > 1e200 || prod < 1e-200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
		sm += (x * x * (zq[i] * zq[i] - 2 * re)) / d;
		sp += (im * (1 + x * x)) / d;
	}
	const pw = c.pPairInvW;
	const pq = c.pPairInvQ;
	for (i = 0; i < pw.length; i++) {
		const x = omega * pw[i];
		const re = 1 - x * x;
		const im = x * pq[i];
		const d = re * re + im * im;
		prod /= d;
		ph -= Math.atan2(im, re);
		if (prod > 1e200 || prod < 1e-200) {
			ln += 0.5 * Math.log(prod);
			prod = 1;
		}
		sm -= (x * x * (pq[i] * pq[i] - 2 * re)) / d;
		sp -= (im * (1 + x * x)) / d;
	}
	out[0] = ln + 0.5 * Math.log(prod);
	out[1] = ph;
	out[2] = sm;
	out[3] = sp;
}

/** Magnitude (dB) and unwrapped phase (deg) of T(jω) at one angular frequency. */
export function evaluatePolar(tf: FactoredTf | CompiledTf, omega: number): { magDb: number; phaseDeg: number } {
	const c = 'lnAbsGain' in tf ? tf : compileTf(tf);
	// A typed array like every other caller's: lnMagPhaseAt's stores stay of one kind (a plain
	// [0, 0] changed its element kind on the first fraction and boxed every number stored).
	const out = new Float64Array(2);
	lnMagPhaseAt(c, omega, out);
	return { magDb: out[0] / LN10_OVER_20, phaseDeg: out[1] * RAD2DEG };
}

/** T(jω) as a complex number. */
export function evaluate(tf: FactoredTf | CompiledTf, omega: number): Complex {
	const c = 'lnAbsGain' in tf ? tf : compileTf(tf);
	// A typed array like every other caller's: lnMagPhaseAt's stores stay of one kind (a plain
	// [0, 0] changed its element kind on the first fraction and boxed every number stored).
	const out = new Float64Array(2);
	lnMagPhaseAt(c, omega, out);
	const m = Math.exp(out[0]);
	return { re: m * Math.cos(out[1]), im: m * Math.sin(out[1]) };
}

export interface FrequencyResponse {
	freqHz: Float64Array;
	magDb: Float64Array;
	/** Unwrapped, continuous from the first frequency (docs/formulas.md §7.6). */
	phaseDeg: Float64Array;
}

/** Bode data of tf on the given grid (Hz). */
export function frequencyResponse(tf: FactoredTf | CompiledTf, freqHz: Float64Array): FrequencyResponse {
	const c = 'lnAbsGain' in tf ? tf : compileTf(tf);
	const n = freqHz.length;
	const magDb = new Float64Array(n);
	const phaseDeg = new Float64Array(n);
	const out = new Float64Array(2);
	for (let i = 0; i < n; i++) {
		lnMagPhaseAt(c, 2 * Math.PI * freqHz[i], out);
		magDb[i] = out[0] / LN10_OVER_20;
		phaseDeg[i] = out[1] * RAD2DEG;
	}
	return { freqHz, magDb, phaseDeg };
}
