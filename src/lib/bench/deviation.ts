/**
 * Model versus measurement over a band: at every measured point inside the band, measured − model in dB and in
 * degrees (the phase difference reduced to (−180°, 180°] so a whole-turn offset between two unwrapped curves is not
 * counted), with the largest absolute value, its frequency, and the RMS. Also a log-frequency interpolator that turns
 * a sampled model response into an evaluator.
 */
import { reduceDeg, type MeasuredResponse } from './metrics';
import type { BenchDeviation, DeviationStats, ModelEvaluator } from './types';

export interface DeviationOptions {
	/** Band to compare, Hz; defaults to the measured range (clip it to fsw/2 where the averaged model stops). */
	startHz?: number;
	stopHz?: number;
}

export type DeviationResult = { ok: true; deviation: BenchDeviation } | { ok: false; message: string };

export function benchDeviation(measured: MeasuredResponse, model: ModelEvaluator, options: DeviationOptions = {}): DeviationResult {
	const start = options.startHz ?? -Infinity;
	const stop = options.stopHz ?? Infinity;
	if (!(start < stop)) return { ok: false, message: `the band must have startHz < stopHz (got ${start} to ${stop})` };
	const f: number[] = [];
	const dm: number[] = [];
	const dp: number[] = [];
	for (let i = 0; i < measured.freqHz.length; i++) {
		const freqHz = measured.freqHz[i];
		if (freqHz < start || freqHz > stop) continue;
		const m = model(freqHz);
		if (!Number.isFinite(m.magDb) || !Number.isFinite(m.phaseDeg)) continue;
		f.push(freqHz);
		dm.push(measured.magDb[i] - m.magDb);
		dp.push(reduceDeg(measured.phaseDeg[i] - m.phaseDeg));
	}
	if (f.length === 0) return { ok: false, message: 'no measured point lies inside the band where the model is evaluated' };
	return {
		ok: true,
		deviation: {
			startHz: f[0],
			stopHz: f[f.length - 1],
			points: f.length,
			magDb: stats(f, dm),
			phaseDeg: stats(f, dp),
			perPoint: { freqHz: f, magDb: dm, phaseDeg: dp }
		}
	};
}

function stats(f: number[], d: number[]): DeviationStats {
	let maxAbs = 0;
	let atHz = f[0];
	let sq = 0;
	for (let i = 0; i < d.length; i++) {
		const a = Math.abs(d[i]);
		if (a > maxAbs) {
			maxAbs = a;
			atHz = f[i];
		}
		sq += d[i] * d[i];
	}
	return { maxAbs, rms: Math.sqrt(sq / d.length), atHz };
}

/**
 * Evaluator over a sampled response (ascending freqHz, unwrapped phase): linear interpolation in log f; outside the
 * sampled range it returns NaN, which benchDeviation skips.
 */
export function sampledEvaluator(response: MeasuredResponse): ModelEvaluator {
	const logs = response.freqHz.map((x) => Math.log(x));
	return (freqHz: number) => {
		const n = logs.length;
		const lf = Math.log(freqHz);
		if (n === 0 || !(lf >= logs[0] && lf <= logs[n - 1])) return { magDb: NaN, phaseDeg: NaN };
		let lo = 0;
		let hi = n - 1;
		while (hi - lo > 1) {
			const mid = (lo + hi) >> 1;
			if (logs[mid] <= lf) lo = mid;
			else hi = mid;
		}
		const t = hi === lo ? 0 : (lf - logs[lo]) / (logs[hi] - logs[lo]);
		return {
			magDb: response.magDb[lo] + t * (response.magDb[hi] - response.magDb[lo]),
			phaseDeg: response.phaseDeg[lo] + t * (response.phaseDeg[hi] - response.phaseDeg[lo])
		};
	};
}
