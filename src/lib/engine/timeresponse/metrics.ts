/**
 * Step-response figures of a sampled waveform [common practice definitions]:
 * - disturbance (load step): peak deviation = largest |y − y0|; settling band = ±2 % of that
 *   peak deviation around the final value; recovery overshoot = the excursion past the final
 *   value on the side opposite the peak.
 * - tracking (reference step): band = ±2 % of |y_final − y0|; overshoot = excursion past the
 *   final value in the step's direction, in % of the step; rise time 10 %→90 %.
 * The settling time is the last exit from the band (linear interpolation between samples);
 * null when the waveform has not settled by its end. The peak is refined by a parabola
 * through the three samples around it.
 */
import type { Waveform } from './simulate';

export interface StepFigures {
	initialValue: number;
	finalValue: number;
	/** Extreme value of y (the largest |y − y0|), and when. */
	peakValue: number;
	peakTimeS: number;
	/** peakValue − initialValue (signed). */
	peakDeviation: number;
	/** Overshoot past the final value: disturbance = opposite side of the peak, tracking = step direction. */
	overshoot: number;
	/** overshoot in % of |peak deviation| (disturbance) or of |step| (tracking). */
	overshootPct: number;
	/** Half-width of the settling band. */
	settlingBand: number;
	settlingTimeS: number | null;
	/** 10 %→90 % rise time (tracking only). */
	riseTimeS: number | null;
}

export interface FigureOptions {
	/** Settling band as a fraction [0.02]. */
	settleFraction?: number;
	kind: 'disturbance' | 'tracking';
}

/** Peak of |y − y0| refined by a parabola through the neighbouring samples. */
function refinedPeak(w: Waveform, y0: number): { value: number; timeS: number } {
	let i = 0;
	let best = -1;
	for (let k = 0; k < w.value.length; k++) {
		const d = Math.abs(w.value[k] - y0);
		if (d > best) {
			best = d;
			i = k;
		}
	}
	if (i === 0 || i === w.value.length - 1) return { value: w.value[i], timeS: w.timeS[i] };
	const [t0, t1, t2] = [w.timeS[i - 1], w.timeS[i], w.timeS[i + 1]];
	const [y0s, y1, y2] = [w.value[i - 1], w.value[i], w.value[i + 1]];
	if (!(Math.abs((t2 - t1) - (t1 - t0)) <= 1e-9 * (t2 - t0))) return { value: y1, timeS: t1 };
	const h = t1 - t0;
	const curv = y0s - 2 * y1 + y2;
	if (curv === 0) return { value: y1, timeS: t1 };
	const dt = (h * (y0s - y2)) / (2 * curv);
	if (Math.abs(dt) > h) return { value: y1, timeS: t1 };
	return { value: y1 - ((y0s - y2) * (y0s - y2)) / (8 * curv), timeS: t1 + dt };
}

/** Last exit from |y − yf| ≤ band, interpolated; null if still outside at the end. */
export function settlingTime(w: Waveform, finalValue: number, band: number, fromS = 0): number | null {
	const n = w.value.length;
	const err = (k: number) => Math.abs(w.value[k] - finalValue) - band;
	if (err(n - 1) > 0) return null;
	let last = -1;
	for (let k = n - 1; k >= 0; k--) {
		if (err(k) > 0) {
			last = k;
			break;
		}
	}
	if (last < 0) return Math.max(0, w.timeS[0] - fromS);
	const ea = err(last);
	const eb = err(last + 1);
	const ta = w.timeS[last];
	const tb = w.timeS[last + 1];
	const t = eb === ea ? tb : ta + ((tb - ta) * ea) / (ea - eb);
	return Math.max(0, t - fromS);
}

export function stepFigures(w: Waveform, finalValue: number, options: FigureOptions): StepFigures {
	const frac = options.settleFraction ?? 0.02;
	const y0 = w.value[0];
	const peak = refinedPeak(w, y0);
	const peakDeviation = peak.value - y0;
	let overshoot = 0;
	if (options.kind === 'disturbance') {
		const side = -Math.sign(peakDeviation);
		for (const y of w.value) overshoot = Math.max(overshoot, side * (y - finalValue));
		const band = frac * Math.abs(peakDeviation);
		return {
			initialValue: y0,
			finalValue,
			peakValue: peak.value,
			peakTimeS: peak.timeS,
			peakDeviation,
			overshoot,
			overshootPct: peakDeviation === 0 ? 0 : (100 * overshoot) / Math.abs(peakDeviation),
			settlingBand: band,
			settlingTimeS: settlingTime(w, finalValue, band),
			riseTimeS: null
		};
	}
	const step = finalValue - y0;
	const dir = Math.sign(step);
	for (const y of w.value) overshoot = Math.max(overshoot, dir * (y - finalValue));
	const band = frac * Math.abs(step);
	return {
		initialValue: y0,
		finalValue,
		peakValue: peak.value,
		peakTimeS: peak.timeS,
		peakDeviation,
		overshoot,
		overshootPct: step === 0 ? 0 : (100 * overshoot) / Math.abs(step),
		settlingBand: band,
		settlingTimeS: settlingTime(w, finalValue, band),
		riseTimeS: riseTime(w, y0, finalValue)
	};
}

/** 10 %→90 % rise time (first crossings, interpolated). */
function riseTime(w: Waveform, y0: number, yf: number): number | null {
	const cross = (level: number): number | null => {
		const target = y0 + level * (yf - y0);
		const dir = Math.sign(yf - y0);
		for (let k = 1; k < w.value.length; k++) {
			if (dir * (w.value[k] - target) >= 0) {
				const a = w.value[k - 1];
				const b = w.value[k];
				return b === a ? w.timeS[k] : w.timeS[k - 1] + ((w.timeS[k] - w.timeS[k - 1]) * (target - a)) / (b - a);
			}
		}
		return null;
	};
	const t10 = cross(0.1);
	const t90 = cross(0.9);
	return t10 === null || t90 === null ? null : t90 - t10;
}
