/**
 * Closed-loop frequency responses evaluated directly as X(jω)/(1 + T(jω)) with the exact delay
 * (docs/formulas.md §8.1, §3): Zo,cl = Zo/(1 + T), Gvg,cl = Gvg/(1 + T), reference to output
 * (1/H)·T/(1 + T) (block-diagram form), sensitivity 1/(1 + T), complementary T/(1 + T).
 * Phase unwrapped without numerical unwrapping: arg(1 + T) = ∠T + arg(1 + 1/T) where |T| ≥ 1
 * (Re(1 + 1/T) ≥ 0 there), and the principal arg(1 + T) plus 360°·k where |T| < 1, with k fixed
 * at each |T| = 1 boundary (found by bisection), where both forms hold.
 */
import { compileTf, lnMagPhaseAt, type CompiledTf } from '../tf/evaluate';
import type { FactoredTf } from '../tf/types';

const RAD2DEG = 180 / Math.PI;
const LN_TO_DB = 20 / Math.LN10;
const TWO_PI = 2 * Math.PI;

export interface Bode {
	magDb: number[];
	phaseDeg: number[];
}

/** ln|1 + T| and the continuous arg(1 + T) (rad) of the loop on an ascending grid. */
export function onePlusLoop(loop: FactoredTf | CompiledTf, freqHz: ArrayLike<number>): { lnMag: Float64Array; phase: Float64Array } {
	const c = 'lnAbsGain' in loop ? loop : compileTf(loop);
	const n = freqHz.length;
	const lnMag = new Float64Array(n);
	const phase = new Float64Array(n);
	const buf = new Float64Array(2);
	const at = (f: number) => {
		lnMagPhaseAt(c, TWO_PI * f, buf);
		return { ln: buf[0], ph: buf[1] };
	};
	// arg(1 + T) by the |T| ≥ 1 form (continuous there) and |1 + T|.
	const high = (ln: number, ph: number) => {
		const inv = Math.exp(-ln);
		return ph + Math.atan2(-inv * Math.sin(ph), 1 + inv * Math.cos(ph));
	};
	const principal = (ln: number, ph: number) => {
		const m = Math.exp(ln);
		return Math.atan2(m * Math.sin(ph), 1 + m * Math.cos(ph));
	};
	let offset = 0; // 2π·k for the current |T| < 1 stretch
	let prevF = 0;
	let prevLn = 0;
	for (let i = 0; i < n; i++) {
		const f = freqHz[i];
		const { ln, ph } = at(f);
		const m = Math.exp(ln);
		lnMag[i] = 0.5 * Math.log((1 + m * Math.cos(ph)) ** 2 + (m * Math.sin(ph)) ** 2);
		if (ln >= 0) phase[i] = high(ln, ph);
		else {
			if (i > 0 && prevLn >= 0) {
				// Entering |T| < 1: match the two forms at the crossing.
				const fx = bisectUnity(at, prevF, f);
				const x = at(fx);
				const a = high(x.ln, x.ph);
				const b = principal(x.ln, x.ph);
				offset = TWO_PI * Math.round((a - b) / TWO_PI);
			}
			phase[i] = principal(ln, ph) + offset;
		}
		prevF = f;
		prevLn = ln;
	}
	return { lnMag, phase };
}

/** Frequency in [lo, hi] where ln|T| changes sign (bisection in log f). */
function bisectUnity(at: (f: number) => { ln: number }, lo: number, hi: number): number {
	let a = Math.log(lo);
	let b = Math.log(hi);
	const sa = at(lo).ln >= 0;
	for (let k = 0; k < 60 && b - a > 1e-13; k++) {
		const mid = 0.5 * (a + b);
		if (at(Math.exp(mid)).ln >= 0 === sa) a = mid;
		else b = mid;
	}
	return Math.exp(0.5 * (a + b));
}

/** Bode data of X/(1 + T) given the precomputed 1 + T (X in factored form, phase from its factors). */
export function overOnePlusLoop(
	x: FactoredTf | null,
	opl: { lnMag: Float64Array; phase: Float64Array },
	freqHz: ArrayLike<number>
): Bode {
	const n = freqHz.length;
	const magDb = new Array<number>(n);
	const phaseDeg = new Array<number>(n);
	const c = x ? compileTf(x) : null;
	const buf = new Float64Array(2);
	for (let i = 0; i < n; i++) {
		let ln = 0;
		let ph = 0;
		if (c) {
			lnMagPhaseAt(c, TWO_PI * freqHz[i], buf);
			ln = buf[0];
			ph = buf[1];
		}
		magDb[i] = (ln - opl.lnMag[i]) * LN_TO_DB;
		phaseDeg[i] = (ph - opl.phase[i]) * RAD2DEG;
	}
	return { magDb, phaseDeg };
}

/** Bode data of a factored transfer function as plain arrays. */
export function bodeOf(tf: FactoredTf, freqHz: ArrayLike<number>): Bode {
	const c = compileTf(tf);
	const buf = new Float64Array(2);
	const magDb: number[] = [];
	const phaseDeg: number[] = [];
	for (let i = 0; i < freqHz.length; i++) {
		lnMagPhaseAt(c, TWO_PI * freqHz[i], buf);
		magDb.push(buf[0] * LN_TO_DB);
		phaseDeg.push(buf[1] * RAD2DEG);
	}
	return { magDb, phaseDeg };
}

export interface ClosedLoopResponsesInput {
	/** Loop gain T = Gc·Fm·Gvd (delay included). */
	loop: FactoredTf;
	/** Open-loop output impedance Zo (Ω). */
	zo: FactoredTf;
	/** Open-loop line-to-output Gvg. */
	gvg: FactoredTf;
	/** DC divider ratio H = Vref/Vout (reference-to-output is (1/H)·T/(1 + T)). */
	dividerRatio: number;
}

export interface ClosedLoopResponses {
	freqHz: number[];
	outputImpedanceOpen: Bode;
	outputImpedanceClosed: Bode;
	lineToOutputOpen: Bode;
	lineToOutputClosed: Bode;
	referenceToOutput: Bode;
	sensitivity: Bode;
	complementarySensitivity: Bode;
	/** Peak of |1/(1 + T)| on the grid (1/modulus margin), dB, and where. */
	sensitivityPeakDb: number;
	sensitivityPeakHz: number;
}

export function closedLoopResponses(input: ClosedLoopResponsesInput, freqHz: ArrayLike<number>): ClosedLoopResponses {
	const opl = onePlusLoop(input.loop, freqHz);
	const sensitivity = overOnePlusLoop(null, opl, freqHz);
	const complementary = overOnePlusLoop(input.loop, opl, freqHz);
	const toDb = -20 * Math.log10(input.dividerRatio);
	const referenceToOutput = {
		magDb: complementary.magDb.map((m) => m + toDb),
		phaseDeg: [...complementary.phaseDeg]
	};
	let iPeak = 0;
	for (let i = 1; i < sensitivity.magDb.length; i++) if (sensitivity.magDb[i] > sensitivity.magDb[iPeak]) iPeak = i;
	return {
		freqHz: Array.from(freqHz),
		outputImpedanceOpen: bodeOf(input.zo, freqHz),
		outputImpedanceClosed: overOnePlusLoop(input.zo, opl, freqHz),
		lineToOutputOpen: bodeOf(input.gvg, freqHz),
		lineToOutputClosed: overOnePlusLoop(input.gvg, opl, freqHz),
		referenceToOutput,
		sensitivity,
		complementarySensitivity: complementary,
		sensitivityPeakDb: sensitivity.magDb[iPeak] ?? 0,
		sensitivityPeakHz: freqHz[iPeak] ?? 0
	};
}
