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

/** Samples start..end (all finite) as a simplified run. */
function simplifyRun(xs: ArrayLike<number>, values: ArrayLike<number>, toY: (v: number) => number, start: number, end: number, tol: number, refs: readonly number[]): PixelRun {
	const count = end - start + 1;
	const px = new Float64Array(count);
	const py = new Float64Array(count);
	for (let k = 0; k < count; k++) {
		px[k] = xs[start + k];
		py[k] = toY(values[start + k]);
	}
	const keep = new Uint8Array(count);
	keep[0] = 1;
	keep[count - 1] = 1;
	for (let k = 1; k < count - 1; k++) {
		const a = values[start + k - 1];
		const b = values[start + k];
		const c = values[start + k + 1];
		// A local extreme, or the edge of a flat stretch (a change of slope sign either side).
		if ((b - a) * (c - b) <= 0 && !(a === b && b === c)) keep[k] = 1;
	}
	for (let k = 0; k < count - 1; k++) {
		const a = values[start + k];
		const b = values[start + k + 1];
		for (const r of refs) {
			if ((a - r) * (b - r) <= 0) {
				keep[k] = 1;
				keep[k + 1] = 1;
			}
		}
	}
	// Douglas–Peucker between consecutive kept samples (an explicit stack: no recursion depth).
	const tol2 = tol * tol;
	const stack: number[] = [];
	let from = 0;
	for (let k = 1; k < count; k++) {
		if (!keep[k]) continue;
		if (k - from > 1) stack.push(from, k);
		from = k;
	}
	while (stack.length) {
		const b = stack.pop()!;
		const a = stack.pop()!;
		const dx = px[b] - px[a];
		const dy = py[b] - py[a];
		const len2 = dx * dx + dy * dy;
		let worst = -1;
		let worstD2 = tol2;
		for (let k = a + 1; k < b; k++) {
			const d2 = len2 === 0 ? (px[k] - px[a]) ** 2 + (py[k] - py[a]) ** 2 : (dy * (px[k] - px[a]) - dx * (py[k] - py[a])) ** 2 / len2;
			if (d2 > worstD2) {
				worstD2 = d2;
				worst = k;
			}
		}
		if (worst < 0) continue;
		keep[worst] = 1;
		if (worst - a > 1) stack.push(a, worst);
		if (b - worst > 1) stack.push(worst, b);
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

/** A canvas's backing size for a CSS size at a device pixel ratio (whole device pixels, at least 1). */
export function backingSize(cssWidth: number, cssHeight: number, dpr: number): { width: number; height: number; scale: number } {
	const scale = Number.isFinite(dpr) && dpr > 0 ? dpr : 1;
	return { width: Math.max(1, Math.round(cssWidth * scale)), height: Math.max(1, Math.round(cssHeight * scale)), scale };
}
