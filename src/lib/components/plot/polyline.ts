/**
 * A trace as the pixel polyline a canvas strokes: samples mapped to CSS pixels, split into runs
 * at non-finite samples (gaps, as the SVG paths skip them), with the samples that move the line
 * by less than a fraction of a pixel left out. No DOM here, so it is tested against the
 * undecimated data.
 *
 * What is always kept: the first and last sample of every run, every local extreme (a peak of
 * the loop gain, the dip of a phase boost) and both samples either side of a crossing of a
 * reference level (0 dB, −180°), so the drawn line passes exactly through the points a reader
 * looks for. Between those, Douglas–Peucker with a perpendicular tolerance in pixels: every left
 * out sample lies within `tolerancePx` of the drawn line.
 */

import { tenths } from './geometry';

/** One unbroken run of a trace: x0, y0, x1, y1, … in CSS pixels. */
export type PixelRun = Float64Array;

export interface PolylineOptions {
	/** Largest distance, px, of a left-out sample from the drawn line [0.25: a quarter of a CSS pixel]. */
	tolerancePx?: number;
	/** Levels in the trace's own units whose crossings are kept (both samples either side). */
	references?: readonly number[];
}

/**
 * The runs of a trace: `xs[i]` is sample i's x pixel (NaN off the axis), `toY` maps a value to
 * its y pixel. Samples where either is not finite end a run.
 */
export function pixelRuns(xs: ArrayLike<number>, values: ArrayLike<number>, toY: (v: number) => number, options: PolylineOptions = {}): PixelRun[] {
	const tol = options.tolerancePx ?? 0.25;
	const refs = options.references ?? [];
	const n = Math.min(xs.length, values.length);
	const runs: PixelRun[] = [];
	let start = -1;
	for (let i = 0; i <= n; i++) {
		const ok = i < n && Number.isFinite(xs[i]) && Number.isFinite(values[i]);
		if (ok && start < 0) start = i;
		if (!ok && start >= 0) {
			runs.push(simplifyRun(xs, values, toY, start, i - 1, tol, refs));
			start = -1;
		}
	}
	return runs;
}

/**
 * Scratch space for simplifyRun, grown to the longest run seen: a redraw simplifies some forty
 * runs per input, and fresh arrays for each were garbage the next collection had to sweep.
 */
let scratchX = new Float64Array(0);
let scratchY = new Float64Array(0);
let scratchKeep = new Uint8Array(0);
let scratchStack = new Int32Array(0);

/** Samples start..end (all finite) as a simplified run. */
function simplifyRun(xs: ArrayLike<number>, values: ArrayLike<number>, toY: (v: number) => number, start: number, end: number, tol: number, refs: readonly number[]): PixelRun {
	const count = end - start + 1;
	if (scratchX.length < count) {
		scratchX = new Float64Array(count);
		scratchY = new Float64Array(count);
		scratchKeep = new Uint8Array(count);
		// Each pending segment holds two entries, and at most count − 1 segments are ever pending.
		scratchStack = new Int32Array(2 * count);
	}
	const px = scratchX;
	const py = scratchY;
	const keep = scratchKeep;
	for (let k = 0; k < count; k++) {
		px[k] = xs[start + k];
		py[k] = toY(values[start + k]);
		keep[k] = 0;
	}
	keep[0] = 1;
	keep[count - 1] = 1;
	for (let k = 1; k < count - 1; k++) {
		const a = values[start + k - 1];
		const b = values[start + k];
		const c = values[start + k + 1];
		// A local extreme, or the edge of a flat stretch (a change of slope sign either side).
		if ((b - a) * (c - b) <= 0 && !(a === b && b === c)) keep[k] = 1;
	}
	for (let r = 0; r < refs.length; r++) {
		const ref = refs[r];
		for (let k = 0; k < count - 1; k++) {
			if ((values[start + k] - ref) * (values[start + k + 1] - ref) <= 0) {
				keep[k] = 1;
				keep[k + 1] = 1;
			}
		}
	}
	// Douglas–Peucker between consecutive kept samples (an explicit stack: no recursion depth).
	const tol2 = tol * tol;
	const stack = scratchStack;
	let top = 0;
	let from = 0;
	for (let k = 1; k < count; k++) {
		if (!keep[k]) continue;
		if (k - from > 1) {
			stack[top++] = from;
			stack[top++] = k;
		}
		from = k;
	}
	while (top > 0) {
		const b = stack[--top];
		const a = stack[--top];
		const ax = px[a];
		const ay = py[a];
		const dx = px[b] - ax;
		const dy = py[b] - ay;
		const len2 = dx * dx + dy * dy;
		let worst = -1;
		let worstD2 = tol2;
		if (len2 === 0) {
			for (let k = a + 1; k < b; k++) {
				const ex = px[k] - ax;
				const ey = py[k] - ay;
				const d2 = ex * ex + ey * ey;
				if (d2 > worstD2) {
					worstD2 = d2;
					worst = k;
				}
			}
		} else {
			// Compared as cross² > tol²·len²: no division per sample.
			let worstCross2 = tol2 * len2;
			for (let k = a + 1; k < b; k++) {
				const cross = dy * (px[k] - ax) - dx * (py[k] - ay);
				const c2 = cross * cross;
				if (c2 > worstCross2) {
					worstCross2 = c2;
					worst = k;
				}
			}
		}
		if (worst < 0) continue;
		keep[worst] = 1;
		if (worst - a > 1) {
			stack[top++] = a;
			stack[top++] = worst;
		}
		if (b - worst > 1) {
			stack[top++] = worst;
			stack[top++] = b;
		}
	}
	let kept = 0;
	for (let k = 0; k < count; k++) kept += keep[k];
	const out = new Float64Array(2 * kept);
	let j = 0;
	for (let k = 0; k < count; k++) {
		if (!keep[k]) continue;
		out[j++] = px[k];
		out[j++] = py[k];
	}
	return out;
}

/**
 * A linear scale as a plain function of the same line (d3's scaleLinear without clamping is
 * r0 + (v − d0)·(r1 − r0)/(d1 − d0)): calling a d3 scale per sample was a fifth of a redraw.
 */
export function linearFunction(scale: { domain(): number[]; range(): number[] }): (v: number) => number {
	const [d0, d1] = scale.domain();
	const [r0, r1] = scale.range();
	const k = d1 === d0 ? 0 : (r1 - r0) / (d1 - d0);
	const mid = (r0 + r1) / 2;
	return d1 === d0 ? () => mid : (v: number) => r0 + (v - d0) * k;
}

/**
 * Runs as SVG path data, coordinates to a tenth of a pixel (as tracePath and d3-shape's
 * `line().digits(1)` write them); a lone sample is a closed zero-length subpath, as in tracePath.
 * The nominal traces are drawn from their simplified runs: about a fourteenth of the samples, so
 * a keystroke builds, parses and paints far shorter paths, within a quarter pixel of the full ones.
 */
export function runsPath(runs: readonly PixelRun[]): string {
	let d = '';
	for (const run of runs) {
		for (let i = 0; i < run.length; i += 2) d += (i === 0 ? 'M' : 'L') + tenths(run[i]) + ',' + tenths(run[i + 1]);
		if (run.length === 2) d += 'Z';
	}
	return d;
}

/** A canvas's backing size for a CSS size at a device pixel ratio (whole device pixels, at least 1). */
export function backingSize(cssWidth: number, cssHeight: number, dpr: number): { width: number; height: number; scale: number } {
	const scale = Number.isFinite(dpr) && dpr > 0 ? dpr : 1;
	return { width: Math.max(1, Math.round(cssWidth * scale)), height: Math.max(1, Math.round(cssHeight * scale)), scale };
}
