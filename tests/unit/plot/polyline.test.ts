// The canvas layer's pixel polylines (plot/polyline.ts) checked against the undecimated data:
// every left-out sample lies within the tolerance of the drawn line (distance to the segment,
// not only to its line), every local extreme and both samples around a crossing of a reference
// level are drawn exactly, and the gaps are those of the SVG path builder (tracePath, itself
// checked against d3-shape in geometry.test.ts). On the demo design's real traces it also leaves
// samples out, which is what it is for.
import fc from 'fast-check';
import { scaleLinear, scaleLog } from 'd3-scale';
import { describe, expect, it } from 'vitest';
import { pixelsX, tracePath } from '$lib/components/plot/geometry';
import { backingSize, linearFunction, pixelRuns, runsPath, type PixelRun } from '$lib/components/plot/polyline';
import { analyzeForm } from '$lib/design/analysis';
import { demoForm, readForm } from '$lib/design/form';

const TOL = 0.25;

/** Distance of (px, py) to the segment a–b. */
function segmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
	const dx = bx - ax;
	const dy = by - ay;
	const len2 = dx * dx + dy * dy;
	const t = len2 === 0 ? 0 : Math.min(1, Math.max(0, ((px - ax) * dx + (py - ay) * dy) / len2));
	return Math.hypot(px - (ax + t * dx), py - (ay + t * dy));
}

/** The finite runs of the original samples as pixel points (no simplification). */
function originalRuns(xs: ArrayLike<number>, values: ArrayLike<number>, toY: (v: number) => number) {
	const runs: { x: number; y: number; v: number }[][] = [];
	let cur: { x: number; y: number; v: number }[] | null = null;
	for (let i = 0; i < Math.min(xs.length, values.length); i++) {
		if (Number.isFinite(xs[i]) && Number.isFinite(values[i])) {
			if (!cur) runs.push((cur = []));
			cur.push({ x: xs[i], y: toY(values[i]), v: values[i] });
		} else cur = null;
	}
	return runs;
}

const has = (run: PixelRun, x: number, y: number) => {
	for (let i = 0; i < run.length; i += 2) if (run[i] === x && run[i + 1] === y) return true;
	return false;
};

/** Checks one trace's simplified runs against its samples; returns how many points were drawn. */
function checkTrace(xs: ArrayLike<number>, values: ArrayLike<number>, toY: (v: number) => number, references: number[]): number {
	const runs = pixelRuns(xs, values, toY, { tolerancePx: TOL, references });
	const originals = originalRuns(xs, values, toY);
	expect(runs.length).toBe(originals.length);
	let drawn = 0;
	runs.forEach((run, r) => {
		const pts = originals[r];
		drawn += run.length / 2;
		// Ends of the run, exactly.
		expect([run[0], run[1]]).toEqual([pts[0].x, pts[0].y]);
		expect([run[run.length - 2], run[run.length - 1]]).toEqual([pts[pts.length - 1].x, pts[pts.length - 1].y]);
		// x never goes back: the drawn points are a subsequence of the samples.
		for (let i = 2; i < run.length; i += 2) expect(run[i]).toBeGreaterThanOrEqual(run[i - 2]);
		// Every sample within the tolerance of the drawn line.
		let seg = 0;
		for (const p of pts) {
			while (seg + 3 < run.length && run[seg + 2] < p.x) seg += 2;
			const d = run.length === 2 ? Math.hypot(p.x - run[0], p.y - run[1]) : segmentDistance(p.x, p.y, run[seg], run[seg + 1], run[seg + 2], run[seg + 3]);
			expect(d).toBeLessThanOrEqual(TOL + 1e-9);
		}
		// Local extremes and crossings, exactly.
		for (let k = 1; k < pts.length - 1; k++) {
			const [a, b, c] = [pts[k - 1].v, pts[k].v, pts[k + 1].v];
			if ((b > a && b > c) || (b < a && b < c)) expect(has(run, pts[k].x, pts[k].y), `extreme at sample ${k}`).toBe(true);
		}
		for (let k = 0; k < pts.length - 1; k++) {
			for (const ref of references) {
				if ((pts[k].v - ref) * (pts[k + 1].v - ref) < 0) {
					expect(has(run, pts[k].x, pts[k].y) && has(run, pts[k + 1].x, pts[k + 1].y), `crossing of ${ref} after sample ${k}`).toBe(true);
				}
			}
		}
	});
	return drawn;
}

describe('pixelRuns', () => {
	const x = scaleLog().domain([10, 1e6]).range([0, 900]);
	const y = scaleLinear().domain([-80, 60]).range([236, 0]);

	it('keeps every sample within a quarter pixel, every extreme and every crossing, on random traces [common practice: Douglas–Peucker keeps each dropped point within its tolerance]', () => {
		const sample = fc.oneof({ weight: 12, arbitrary: fc.double({ min: -70, max: 50, noNaN: true }) }, { weight: 1, arbitrary: fc.constantFrom(NaN, Infinity, -Infinity) });
		fc.assert(
			fc.property(fc.array(sample, { maxLength: 120 }), (values) => {
				const freqHz = values.map((_, i) => 10 * 1.1 ** i);
				const xs = pixelsX(x, freqHz);
				checkTrace(xs, values, y, [0]);
				// Gaps where the SVG path builder has them: one run per "M".
				expect(pixelRuns(xs, values, y).length).toBe((tracePath(x, y, freqHz, values).match(/M/g) ?? []).length);
			})
		);
	});

	it('draws the demo design’s traces with fewer points and the same shape [common practice: the tolerance check above, on the engine’s own 400-point traces]', () => {
		const outcome = analyzeForm(readForm(demoForm()));
		if (!outcome.ok) throw new Error(outcome.message);
		const a = outcome.analysis;
		const xs = pixelsX(scaleLog().domain([a.freqHz[0], a.freqHz[a.freqHz.length - 1]]).range([0, 900]), a.freqHz);
		const yPhase = scaleLinear().domain([-270, 90]).range([196, 0]);
		let samples = 0;
		let drawn = 0;
		for (const c of a.corners) {
			const r = c.detail!.response.response;
			for (const t of [r.loop, r.plant]) {
				samples += 2 * t.magDb.length;
				drawn += checkTrace(xs, t.magDb, y, [0]) + checkTrace(xs, t.phaseDeg, yPhase, [-180]);
			}
		}
		expect(samples).toBeGreaterThan(0);
		// The smooth stretches of a Bode plot need few points at a quarter-pixel tolerance.
		expect(drawn).toBeLessThan(samples / 2);
	});
});

describe('backingSize', () => {
	it('is the CSS size times the device pixel ratio in whole pixels [published: HTML canvas, devicePixelRatio]', () => {
		expect(backingSize(300, 200, 2)).toEqual({ width: 600, height: 400, scale: 2 });
		expect(backingSize(301, 100, 1.5)).toEqual({ width: 452, height: 150, scale: 1.5 });
		expect(backingSize(300, 200, 0)).toEqual({ width: 300, height: 200, scale: 1 });
		expect(backingSize(0, 0, 1)).toEqual({ width: 1, height: 1, scale: 1 });
	});
});

describe('linearFunction', () => {
	// The canvas layer maps values with a plain function of the d3 scale's line; it must give d3's
	// own pixels (d3-scale, the reference library the SVG traces use) to far below a pixel.
	it('gives the d3 linear scale’s pixel for any domain, range and value', () => {
		fc.assert(
			fc.property(
				fc.double({ min: -400, max: 400, noNaN: true }),
				fc.double({ min: 1, max: 400, noNaN: true }),
				fc.double({ min: 10, max: 600, noNaN: true }),
				fc.double({ min: -1000, max: 1000, noNaN: true }),
				(d0, span, h, v) => {
					const scale = scaleLinear().domain([d0, d0 + span]).range([h, 0]);
					expect(Math.abs(linearFunction(scale)(v) - scale(v))).toBeLessThan(1e-9 * Math.max(1, Math.abs(scale(v))));
				}
			)
		);
	});

	it('maps every value of an empty domain to the middle of the range, as d3 does', () => {
		const scale = scaleLinear().domain([3, 3]).range([200, 0]);
		expect(linearFunction(scale)(7)).toBe(scale(7));
		expect(linearFunction(scale)(7)).toBe(100);
	});
});

describe('runsPath', () => {
	// The nominal traces' SVG path data: the simplified runs, each a subpath, coordinates to a tenth
	// of a pixel as d3-shape's line().digits(1) writes them (common practice for SVG plots; the
	// rounding is tracePath's, checked against d3-shape in geometry.test.ts).
	it('writes each run as one subpath of its points to a tenth of a pixel, a lone sample closed', () => {
		const runs = [Float64Array.of(0, 10.04, 12.25, 8.96, 30.5, -2.449), Float64Array.of(40, 5)];
		expect(runsPath(runs)).toBe('M0,10L12.3,9L30.5,-2.4M40,5Z');
	});

	it('on the demo design’s traces passes through every point of the simplified runs and through nothing else', () => {
		const outcome = analyzeForm(readForm(demoForm()));
		if (!outcome.ok) throw new Error(outcome.message);
		const a = outcome.analysis;
		const x = scaleLog().domain([a.freqHz[0], a.freqHz[a.freqHz.length - 1]]).range([0, 900]);
		const xs = pixelsX(x, a.freqHz);
		const y = scaleLinear().domain([-60, 80]).range([236, 0]);
		const loop = a.nominal.response.response.loop.magDb;
		const runs = pixelRuns(xs, loop, linearFunction(y), { references: [0] });
		const d = runsPath(runs);
		const points = [...d.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
		const expected = runs.flatMap((r) => Array.from({ length: r.length / 2 }, (_, i) => [Math.round(r[2 * i] * 10) / 10, Math.round(r[2 * i + 1] * 10) / 10]));
		expect(points).toEqual(expected);
		// Far fewer points than the full path of the same trace.
		expect(points.length).toBeLessThan((tracePath(x, y, a.freqHz, loop, xs).match(/[ML]/g) ?? []).length / 4);
	});
});
