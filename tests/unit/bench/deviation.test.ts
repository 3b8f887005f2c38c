import { describe, expect, it } from 'vitest';
import { benchDeviation, parseBenchFile, sampledEvaluator } from '$lib/bench';
import { evaluatePolar, pairRootHz, realRootHz, type FactoredTf } from '$lib/engine';
import { expected, fixture } from './fixtures';

describe('benchDeviation: a measured plant against its model', () => {
	const name = 'buck-plant-l-high.csv';
	const want = expected.files[name];
	// The nominal model of reference/bench/generate.py, built with the engine's factored transfer functions.
	const model: FactoredTf = {
		gain: want.model.gain,
		originPower: 0,
		zeros: [realRootHz(want.model.esrZeroHz)],
		poles: [pairRootHz(want.model.f0Hz, want.model.q)]
	};
	const evaluator = (freqHz: number) => evaluatePolar(model, 2 * Math.PI * freqHz);

	it('max and RMS deviation in dB and degrees over 500 Hz – 100 kHz match numpy on the same points', () => {
		const r = parseBenchFile(fixture(name));
		if (!r.ok) throw new Error(JSON.stringify(r.errors));
		const d = benchDeviation(r.data, evaluator, { startHz: want.band.startHz, stopHz: want.band.stopHz });
		if (!d.ok) throw new Error(d.message);
		// [scipy/numpy: reference/bench/generate.py, measured L +10 % vs nominal, file values as rounded]
		expect(d.deviation.points).toBe(want.band.points);
		expect(d.deviation.magDb.maxAbs).toBeCloseTo(want.magDb.maxAbs, 6);
		expect(d.deviation.magDb.rms).toBeCloseTo(want.magDb.rms, 6);
		expect(d.deviation.magDb.atHz).toBeCloseTo(want.magDb.atHz, 3);
		expect(d.deviation.phaseDeg.maxAbs).toBeCloseTo(want.phaseDeg.maxAbs, 5);
		expect(d.deviation.phaseDeg.rms).toBeCloseTo(want.phaseDeg.rms, 5);
		expect(d.deviation.perPoint.freqHz).toHaveLength(want.band.points);
	});

	it('a whole-turn phase offset between the two curves is no deviation', () => {
		const measured = { freqHz: [10, 100], magDb: [1, 2], phaseDeg: [-90, -100] };
		const d = benchDeviation(measured, (f) => ({ magDb: f === 10 ? 1 : 2, phaseDeg: f === 10 ? 270 : 260 }));
		if (!d.ok) throw new Error(d.message);
		expect(d.deviation.phaseDeg.maxAbs).toBe(0);
	});

	it('no point inside the band is an error, not NaN', () => {
		const d = benchDeviation({ freqHz: [10, 100], magDb: [0, 0], phaseDeg: [0, 0] }, evaluator, { startHz: 1e3, stopHz: 1e4 });
		expect(d.ok).toBe(false);
	});

	it('sampledEvaluator interpolates on log f and refuses to extrapolate', () => {
		const ev = sampledEvaluator({ freqHz: [100, 10000], magDb: [20, -20], phaseDeg: [-90, -130] });
		// 1 kHz is halfway between 100 Hz and 10 kHz on a log axis [common practice]
		expect(ev(1000).magDb).toBeCloseTo(0, 12);
		expect(ev(1000).phaseDeg).toBeCloseTo(-110, 12);
		expect(Number.isNaN(ev(20000).magDb)).toBe(true);
	});
});
