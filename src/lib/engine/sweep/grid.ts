/**
 * Frequency grids in Hz as Float64Array. Log grids include both ends exactly; points are
 * spaced evenly in log10 f.
 */

/** `points` log-spaced frequencies from startHz to stopHz, both included (points ≥ 2). */
export function logGrid(startHz: number, stopHz: number, points: number): Float64Array {
	if (!(startHz > 0) || !(stopHz > startHz)) throw new Error('logGrid: need 0 < startHz < stopHz');
	if (!Number.isInteger(points) || points < 2) throw new Error('logGrid: need an integer points ≥ 2');
	const out = new Float64Array(points);
	const a = Math.log10(startHz);
	const step = (Math.log10(stopHz) - a) / (points - 1);
	for (let i = 0; i < points; i++) out[i] = Math.pow(10, a + i * step);
	out[0] = startHz;
	out[points - 1] = stopHz;
	return out;
}

/** Log grid with a given density (points per decade, at least 2 points in all). */
export function logGridPerDecade(startHz: number, stopHz: number, pointsPerDecade: number): Float64Array {
	const decades = Math.log10(stopHz / startHz);
	return logGrid(startHz, stopHz, Math.max(2, Math.ceil(decades * pointsPerDecade) + 1));
}

/** Sorted union of grids with exact duplicates removed. */
export function mergeGrids(...grids: Float64Array[]): Float64Array {
	const all = new Float64Array(grids.reduce((n, g) => n + g.length, 0));
	let k = 0;
	for (const g of grids) {
		all.set(g, k);
		k += g.length;
	}
	all.sort();
	let w = 0;
	for (let i = 0; i < all.length; i++) if (i === 0 || all[i] !== all[w - 1]) all[w++] = all[i];
	return all.slice(0, w);
}

/** Default analysis sweep (design-document.md): two decades below f0 up to fsw/2. */
export function defaultSweepRange(f0Hz: number, fswHz: number): { startHz: number; stopHz: number } {
	const stopHz = fswHz / 2;
	let startHz = f0Hz / 100;
	if (!(startHz < stopHz / 10)) startHz = stopHz / 1000; // keep at least 3 decades
	return { startHz, stopHz };
}
