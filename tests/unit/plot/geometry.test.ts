// The Bode plot's path builder against d3-shape's line generator, the outside reference it
// replaced for speed: the same string for any samples, gaps (NaN, ±Infinity, f ≤ 0) and lone
// points included, so the screen draws exactly what it drew before.
import fc from 'fast-check';
import { line } from 'd3-shape';
import { scaleLinear, scaleLog } from 'd3-scale';
import { describe, expect, it } from 'vitest';
import { pixelsX, tenths, tracePath } from '$lib/components/plot/geometry';

function d3Path(x: (f: number) => number, y: (v: number) => number, freqHz: number[], values: number[]) {
	const idx = Array.from({ length: Math.min(freqHz.length, values.length) }, (_, i) => i);
	return (
		line<number>()
			.digits(1)
			.defined((i) => freqHz[i] > 0 && Number.isFinite(freqHz[i]) && Number.isFinite(values[i]))
			.x((i) => x(freqHz[i]))
			.y((i) => y(values[i]))(idx) ?? ''
	);
}

const x = scaleLog().domain([10, 1e6]).range([0, 1180]);
const y = scaleLinear().domain([-80, 60]).range([236, 0]);

describe('tracePath', () => {
	it('builds the same string as d3-shape line().digits(1) [published: d3-shape line and d3-path digits]', () => {
		const sample = fc.oneof(
			{ weight: 8, arbitrary: fc.double({ min: -200, max: 200, noNaN: true }) },
			{ weight: 1, arbitrary: fc.constantFrom(NaN, Infinity, -Infinity) }
		);
		fc.assert(
			fc.property(fc.array(sample, { maxLength: 60 }), fc.integer({ min: 0, max: 3 }), (values, badFreqs) => {
				const freqHz = values.map((_, i) => 10 * 1.3 ** i);
				for (let k = 0; k < badFreqs && k < freqHz.length; k++) freqHz[(k * 7) % freqHz.length] = k % 2 ? 0 : -5;
				expect(tracePath(x, y, freqHz, values)).toBe(d3Path(x, y, freqHz, values));
			})
		);
	});

	it('closes a lone point between gaps with Z, as d3 does, and gives "" for nothing to draw [published: d3-shape curveLinear]', () => {
		const freqHz = [10, 100, 1000, 10_000];
		expect(tracePath(x, y, freqHz, [NaN, 0, NaN, NaN])).toBe(d3Path(x, y, freqHz, [NaN, 0, NaN, NaN]));
		expect(tracePath(x, y, freqHz, [NaN, 0, NaN, NaN])).toMatch(/^M[\d.]+,[\d.]+Z$/);
		expect(tracePath(x, y, freqHz, [NaN, NaN, NaN, NaN])).toBe('');
	});

	it('takes precomputed x pixels shared by every trace of a grid', () => {
		const freqHz = [10, 31.6, 100, 316, 1000];
		const values = [20, 10, 0, -10, -20];
		expect(tracePath(x, y, freqHz, values, pixelsX(x, freqHz))).toBe(tracePath(x, y, freqHz, values));
	});
});

describe('tenths', () => {
	it('is String(Math.round(v * 10) / 10), the rounding d3-path applies with digits(1) [published: d3-path pathRound]', () => {
		fc.assert(
			fc.property(fc.double({ min: -1e7, max: 1e7, noNaN: true }), (v) => {
				expect(tenths(v)).toBe(String(Math.round(v * 10) / 10));
			})
		);
		for (const v of [0, -0, -0.04, -0.05, -0.25, 0.05, 0.95, 9.96, -123.45, 1e6 + 0.06]) expect(tenths(v)).toBe(String(Math.round(v * 10) / 10));
	});
});
