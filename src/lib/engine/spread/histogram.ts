/**
 * Histograms and summary statistics of a sample, NaN entries counted as missing. Log bins
 * for frequencies, linear for margins; percentiles by linear interpolation between order
 * statistics (the "type 7" definition, numpy's default) [published: Hyndman & Fan, The
 * American Statistician 50(4), 1996; from memory].
 */
export interface Histogram {
	/** bins + 1 ascending edges; empty when no finite values. */
	edges: number[];
	counts: number[];
	scale: 'linear' | 'log';
	missing: number;
}

export interface Statistics {
	count: number;
	missing: number;
	min: number | null;
	max: number | null;
	mean: number | null;
	std: number | null;
	p1: number | null;
	p5: number | null;
	p50: number | null;
	p95: number | null;
	p99: number | null;
}

function finiteSorted(x: ArrayLike<number>): Float64Array {
	const out: number[] = [];
	for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i])) out.push(x[i]);
	return Float64Array.from(out).sort();
}

export function histogram(x: ArrayLike<number>, bins: number, scale: 'linear' | 'log'): Histogram {
	const v = finiteSorted(x);
	const missing = x.length - v.length;
	if (v.length === 0 || (scale === 'log' && !(v[0] > 0))) return { edges: [], counts: [], scale, missing };
	const tr = scale === 'log' ? Math.log10 : (a: number) => a;
	const inv = scale === 'log' ? (a: number) => 10 ** a : (a: number) => a;
	let lo = tr(v[0]);
	let hi = tr(v[v.length - 1]);
	if (hi === lo) {
		const pad = Math.abs(lo) * 1e-6 || 1e-6;
		lo -= pad;
		hi += pad;
	}
	const edges = Array.from({ length: bins + 1 }, (_, i) => inv(lo + ((hi - lo) * i) / bins));
	const counts = new Array<number>(bins).fill(0);
	for (const a of v) {
		const k = Math.min(bins - 1, Math.max(0, Math.floor(((tr(a) - lo) / (hi - lo)) * bins)));
		counts[k]++;
	}
	return { edges, counts, scale, missing };
}

export function percentile(sorted: Float64Array, p: number): number | null {
	const n = sorted.length;
	if (n === 0) return null;
	const h = (n - 1) * p;
	const i = Math.floor(h);
	return i + 1 < n ? sorted[i] + (h - i) * (sorted[i + 1] - sorted[i]) : sorted[n - 1];
}

export function statistics(x: ArrayLike<number>): Statistics {
	const v = finiteSorted(x);
	const n = v.length;
	let mean = 0;
	for (const a of v) mean += a;
	mean = n ? mean / n : 0;
	let ss = 0;
	for (const a of v) ss += (a - mean) ** 2;
	return {
		count: n,
		missing: x.length - n,
		min: n ? v[0] : null,
		max: n ? v[n - 1] : null,
		mean: n ? mean : null,
		std: n > 1 ? Math.sqrt(ss / (n - 1)) : null,
		p1: percentile(v, 0.01),
		p5: percentile(v, 0.05),
		p50: percentile(v, 0.5),
		p95: percentile(v, 0.95),
		p99: percentile(v, 0.99)
	};
}
