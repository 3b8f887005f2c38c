import { describe, expect, it } from 'vitest';
import { logGrid, logGridPerDecade, mergeGrids } from '$lib/engine/sweep';

describe('log grids', () => {
	it('include both ends exactly and are evenly spaced in log f', () => {
		// [common practice: logspace with both ends, like numpy.logspace]
		const g = logGrid(10, 1e6, 401);
		expect(g[0]).toBe(10);
		expect(g[400]).toBe(1e6);
		expect(g[160]).toBeCloseTo(1000, 9); // 80 points per decade
		expect(() => logGrid(10, 10, 5)).toThrow();
		expect(logGridPerDecade(1, 1000, 10).length).toBe(31);
		expect(Array.from(mergeGrids(Float64Array.of(1, 3), Float64Array.of(2, 3)))).toEqual([1, 2, 3]);
	});
});
