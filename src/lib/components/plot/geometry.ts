/**
 * Pure helpers of the Bode plot: scales' domains, log-axis ticks, SVG path strings that skip
 * non-finite samples, and log-frequency interpolation for the hover readout. No DOM here.
 */
import type { ScaleLinear, ScaleLogarithmic } from 'd3-scale';
import type { BodeTrace, TraceVisibility } from './types';

/** The x pixel of every sample (one scale evaluation per frequency, shared by all traces of a grid). */
export function pixelsX(x: ScaleLogarithmic<number, number>, freqHz: ArrayLike<number>): Float64Array {
	const out = new Float64Array(freqHz.length);
	for (let i = 0; i < freqHz.length; i++) out[i] = freqHz[i] > 0 && Number.isFinite(freqHz[i]) ? x(freqHz[i]) : NaN;
	return out;
}

/**
 * `String(Math.round(v * 10) / 10)` (d3-path's rounding to one digit) built from integers: V8
 * turns a small integer into text many times faster than a fraction, and a path has 800 numbers.
 */
export function tenths(v: number): string {
	let t = Math.round(v * 10);
	if (t === 0) return '0';
	let sign = '';
	if (t < 0) {
		sign = '-';
		t = -t;
	}
	const whole = Math.floor(t / 10);
	const digit = t - whole * 10;
	return digit === 0 ? sign + whole : sign + whole + '.' + digit;
}

/**
 * Path through (freqHz[i], values[i]); samples that are not finite (or off a log axis) are gaps.
 * The same string d3-shape's `line().digits(1)` builds (coordinates rounded to a tenth of a
 * pixel, a new `M` after each gap, a lone point closed with `Z`), written as one loop over
 * precomputed x pixels with integer-built numbers: a keystroke redraws 38 of these (9 corners'
 * loop and plant and the network, magnitude and phase) and d3's per-point callbacks and
 * fraction-to-text conversions were most of that frame's script time (about 10× slower).
 */
export function tracePath(
	x: ScaleLogarithmic<number, number>,
	y: ScaleLinear<number, number>,
	freqHz: ArrayLike<number>,
	values: ArrayLike<number>,
	xs: ArrayLike<number> = pixelsX(x, freqHz)
): string {
	const n = Math.min(freqHz.length, values.length);
	let d = '';
	let run = 0;
	for (let i = 0; i < n; i++) {
		const v = values[i];
		const px = xs[i];
		if (!Number.isFinite(px) || !Number.isFinite(v)) {
			if (run === 1) d += 'Z';
			run = 0;
			continue;
		}
		d += (run === 0 ? 'M' : 'L') + tenths(px) + ',' + tenths(y(v));
		run++;
	}
	if (run === 1) d += 'Z';
	return d;
}

export interface LogTicks {
	/** Decades, labelled. */
	major: number[];
	/** 2…9 × decade, grid only. */
	minor: number[];
}

export function logTicks(startHz: number, stopHz: number): LogTicks {
	const major: number[] = [];
	const minor: number[] = [];
	if (!(startHz > 0) || !(stopHz > startHz)) return { major, minor };
	for (let e = Math.floor(Math.log10(startHz)); e <= Math.ceil(Math.log10(stopHz)); e++) {
		const decade = 10 ** e;
		if (decade >= startHz * (1 - 1e-9) && decade <= stopHz * (1 + 1e-9)) major.push(decade);
		for (let k = 2; k <= 9; k++) {
			const f = k * decade;
			if (f > startHz && f < stopHz) minor.push(f);
		}
	}
	return { major, minor };
}

function finiteRange(traces: BodeTrace[], pick: (t: BodeTrace) => ArrayLike<number>): [number, number] | null {
	let lo = Infinity;
	let hi = -Infinity;
	for (const t of traces) {
		const v = pick(t);
		for (let i = 0; i < v.length; i++) {
			const y = v[i];
			if (!Number.isFinite(y)) continue;
			if (y < lo) lo = y;
			if (y > hi) hi = y;
		}
	}
	return lo <= hi ? [lo, hi] : null;
}

/** Magnitude axis: outward to 20 dB steps, at least 40 dB tall, always showing 0 dB, within ±160 dB. */
export function magDomain(traces: BodeTrace[], visible: TraceVisibility): [number, number] {
	const r = finiteRange(
		traces.filter((t) => visible[t.kind]),
		(t) => t.magDb
	);
	if (!r) return [-40, 60];
	let lo = Math.max(-160, Math.floor(Math.min(r[0], -20) / 20) * 20);
	let hi = Math.min(160, Math.ceil(Math.max(r[1], 20) / 20) * 20);
	if (hi - lo < 40) hi = lo + 40;
	return [lo, hi];
}

/** Phase axis: outward to 45° steps, always showing −180° when the loop is drawn. */
export function phaseDomain(traces: BodeTrace[], visible: TraceVisibility): [number, number] {
	const r = finiteRange(
		traces.filter((t) => visible[t.kind]),
		(t) => t.phaseDeg
	);
	if (!r) return [-270, 0];
	let lo = Math.floor(r[0] / 45) * 45;
	let hi = Math.ceil(r[1] / 45) * 45;
	if (visible.loop) lo = Math.min(lo, -180);
	lo = Math.max(lo, -720);
	hi = Math.min(hi, 360);
	if (hi - lo < 90) hi = lo + 90;
	return [lo, hi];
}

/** Evenly spaced ticks on a linear axis with a step from the list that gives ≤ maxTicks. */
export function stepTicks([lo, hi]: [number, number], steps: number[], maxTicks: number): number[] {
	const step = steps.find((s) => (hi - lo) / s <= maxTicks) ?? steps[steps.length - 1];
	const out: number[] = [];
	for (let v = Math.ceil(lo / step) * step; v <= hi + 1e-9; v += step) out.push(Math.abs(v) < 1e-9 ? 0 : v);
	return out;
}

/** values at freqHz = f, linear in log f between neighbours; null outside the grid or at a gap. */
export function valueAt(freqHz: ArrayLike<number>, values: ArrayLike<number>, f: number): number | null {
	const n = Math.min(freqHz.length, values.length);
	if (n === 0 || !(f > 0) || f < freqHz[0] || f > freqHz[n - 1]) return null;
	let lo = 0;
	let hi = n - 1;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (freqHz[mid] <= f) lo = mid;
		else hi = mid;
	}
	const a = values[lo];
	const b = values[hi];
	if (!Number.isFinite(a) || !Number.isFinite(b)) return null;
	if (hi === lo) return a;
	const t = (Math.log(f) - Math.log(freqHz[lo])) / (Math.log(freqHz[hi]) - Math.log(freqHz[lo]));
	return a + (b - a) * Math.min(1, Math.max(0, t));
}

/** Width of a mono label in px (JetBrains Mono advances 0.6 em). */
export const monoWidth = (text: string, fontPx: number) => text.length * fontPx * 0.6;
