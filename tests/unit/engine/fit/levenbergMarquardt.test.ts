import { describe, expect, it } from 'vitest';
import { levenbergMarquardt, normalEquations, spdInverse } from '$lib/engine/fit/levenbergMarquardt';

// NIST StRD nonlinear regression, "Misra1a" (lower difficulty): y = b1·(1 − exp(−b2·x)), 14 points
// [published: NIST Statistical Reference Datasets, Misra1a certified values; data and values from memory,
// re-checked with scipy.optimize.least_squares in python3, which reproduces every certified digit below].
const x = [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0];
const y = [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.4, 75.47, 81.78];
const residuals = (data: number[]) => (b: readonly number[]) => Float64Array.from(x, (xi, i) => data[i] - b[0] * (1 - Math.exp(-b[1] * xi)));
const free = { lower: [-Infinity, -Infinity], upper: [Infinity, Infinity] };

describe('bounded robust Levenberg–Marquardt', () => {
	it('reaches the certified Misra1a estimates, standard deviations and residual sum of squares from both NIST starts', () => {
		for (const start of [
			[500, 1e-4],
			[250, 5e-4]
		]) {
			const r = levenbergMarquardt(residuals(y), start, { ...free, loss: 'linear', maxIterations: 200, diffStep: 1e-8 });
			expect(r.converged).toBe(true);
			// [published: NIST StRD Misra1a] b1 = 2.3894212918E+02, b2 = 5.5015643181E-04, RSS = 1.2455138894E-01.
			expect(r.theta[0]).toBeCloseTo(238.94212918, 4);
			expect(r.theta[1] / 5.5015643181e-4).toBeCloseTo(1, 6);
			expect(2 * r.cost).toBeCloseTo(0.12455138894, 8);
			// sd = sqrt(s²·diag((JᵀJ)⁻¹)), s² = RSS/(n − p) [published: NIST StRD Misra1a: 2.7070075241E+00, 7.2668688436E-06].
			const { a } = normalEquations(r.jacobian, r.residuals, r.weights, 2);
			const inv = spdInverse(a, 2)!;
			const s2 = (2 * r.cost) / 12;
			expect(Math.sqrt(inv[0] * s2) / 2.7070075241).toBeCloseTo(1, 3);
			expect(Math.sqrt(inv[3] * s2) / 7.2668688436e-6).toBeCloseTo(1, 3);
		}
	});

	it('stops on an active bound where scipy does (b1 ≤ 200)', () => {
		const r = levenbergMarquardt(residuals(y), [150, 1e-4], { lower: [0, 0], upper: [200, 1], loss: 'linear', maxIterations: 200, diffStep: 1e-8 });
		// [scipy: least_squares(bounds=([0,0],[200,1])) → b1 = 200 (active), b2 = 6.79059367e-04]
		expect(r.theta[0]).toBe(200);
		expect(r.theta[1] / 6.79059367e-4).toBeCloseTo(1, 5);
	});

	it('with the soft-L1 loss, two corrupted points move the estimate as little as they move scipy’s', () => {
		const bad = [...y];
		bad[5] += 8;
		bad[10] -= 6;
		const r = levenbergMarquardt(residuals(bad), [500, 1e-4], { ...free, loss: 'soft-l1', fScale: 0.2, maxIterations: 300, diffStep: 1e-8 });
		// [scipy: least_squares(loss='soft_l1', f_scale=0.2) → b1 = 2.36958155e+02, b2 = 5.55471331e-04]
		expect(r.theta[0] / 236.958155).toBeCloseTo(1, 5);
		expect(r.theta[1] / 5.55471331e-4).toBeCloseTo(1, 5);
	});

	it('says a direction the data do not determine is singular instead of inventing an interval', () => {
		// Two identical columns: JᵀJ has rank 1.
		const jac = Float64Array.from([1, 1, 2, 2, 3, 3]);
		const { a } = normalEquations(jac, Float64Array.from([0, 0, 0]), Float64Array.from([1, 1, 1]), 2);
		expect(spdInverse(a, 2)).toBeNull();
	});
});
