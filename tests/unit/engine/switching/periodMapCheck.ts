// The switching tests' one check of a period-map Jacobian: the analytic matrix against central
// finite differences of the map itself, column by column.
import { expect } from 'vitest';

/**
 * Expects `jacobian` (row-major, nc × nc over the circuit states, the first nc entries of `x0`; the
 * exogenous states after them stay as they are) to equal the central differences of `map` at `x0`
 * within `relTol` × max(1, |difference quotient|) per entry. The step is 1e-6 of each state's size
 * (at least 1e-9), small against the orbit's curvature and far above the map's rounding.
 */
export function expectJacobianMatchesMap(map: (x: Float64Array) => Float64Array, x0: Float64Array, jacobian: Float64Array, relTol: number): void {
	const nc = Math.round(Math.sqrt(jacobian.length));
	for (let j = 0; j < nc; j++) {
		const step = 1e-6 * Math.max(1e-3, Math.abs(x0[j]));
		const plus = Float64Array.from(x0);
		const minus = Float64Array.from(x0);
		plus[j] += step;
		minus[j] -= step;
		const a = map(plus);
		const b = map(minus);
		for (let i = 0; i < nc; i++) {
			const fd = (a[i] - b[i]) / (2 * step);
			expect(Math.abs(jacobian[i * nc + j] - fd), `∂x${i}/∂x${j}`).toBeLessThan(relTol * Math.max(1, Math.abs(fd)));
		}
	}
}
