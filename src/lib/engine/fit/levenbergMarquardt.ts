/**
 * Bounded, robust Levenberg–Marquardt for a handful of parameters (docs/formulas.md §11.2).
 *
 * Minimises C(θ) = ½·Σ ρ(r_i(θ)²) over lower ≤ θ ≤ upper, with ρ the soft-L1 loss
 * ρ(z) = 2·s²·(√(1 + z/s²) − 1) (s = `fScale`; scipy.optimize.least_squares' 'soft_l1' with the
 * same f_scale) or the plain square ρ(z) = z. Each step solves the iteratively reweighted
 * Gauss–Newton system (JᵀWJ + λ·diag(JᵀWJ))·δ = −JᵀWr with W = diag(ρ′(r_i²)): JᵀWr is the exact
 * gradient of C, so an accepted step always lowers the robust cost. Bounds: a parameter sitting
 * on a bound whose gradient pushes it outward is held for that step, the others step and are
 * clipped. The Jacobian is by central differences (the models are cheap, derivatives by hand
 * would duplicate them).
 *
 * Written here rather than taken from a package: mathjs (already a dependency) has no
 * least-squares solver, and the npm curve-fitting LM package (ml-levenberg-marquardt) fits real
 * y(x) samples with clamped bounds but no robust loss and returns no Jacobian for the intervals.
 */

export type FitLoss = 'linear' | 'soft-l1';

export interface LmOptions {
	lower: readonly number[];
	upper: readonly number[];
	loss?: FitLoss;
	/** Residual scale s of the soft-L1 loss (residuals well below s count as squares). */
	fScale?: number;
	/** Most Jacobian evaluations (outer iterations). */
	maxIterations?: number;
	/** Stop when the relative cost decrease of an accepted step is below this. */
	costTolerance?: number;
	/** Central-difference step in θ. */
	diffStep?: number;
}

export interface LmResult {
	theta: number[];
	/** Robust cost ½·Σρ(r²) at the start and at the end. */
	initialCost: number;
	cost: number;
	residuals: Float64Array;
	/** Jacobian of the raw residuals at the solution, row-major m × p. */
	jacobian: Float64Array;
	/** ρ′(r_i²) at the solution (1 for the linear loss). */
	weights: Float64Array;
	iterations: number;
	evaluations: number;
	converged: boolean;
	/** Why it stopped, in words. */
	stop: string;
}

/** Residuals at θ; must return the same length every call and only finite numbers (else the step is refused). */
export type ResidualFunction = (theta: readonly number[]) => Float64Array;

export function lossWeight(loss: FitLoss, r2: number, fScale: number): number {
	return loss === 'linear' ? 1 : 1 / Math.sqrt(1 + r2 / (fScale * fScale));
}

export function robustCost(loss: FitLoss, r: Float64Array, fScale: number): number {
	let c = 0;
	const s2 = fScale * fScale;
	for (let i = 0; i < r.length; i++) {
		const z = r[i] * r[i];
		c += loss === 'linear' ? z : 2 * s2 * (Math.sqrt(1 + z / s2) - 1);
	}
	return 0.5 * c;
}

const allFinite = (r: Float64Array) => {
	for (let i = 0; i < r.length; i++) if (!Number.isFinite(r[i])) return false;
	return true;
};

/** Central-difference Jacobian of f at θ, row-major m × p. */
export function jacobianCentral(f: ResidualFunction, theta: readonly number[], m: number, h: number): Float64Array {
	const p = theta.length;
	const jac = new Float64Array(m * p);
	for (let k = 0; k < p; k++) {
		const up = [...theta];
		const down = [...theta];
		up[k] += h;
		down[k] -= h;
		const ru = f(up);
		const rd = f(down);
		for (let i = 0; i < m; i++) jac[i * p + k] = (ru[i] - rd[i]) / (2 * h);
	}
	return jac;
}

/** JᵀWJ (p × p) and JᵀWr (p). */
export function normalEquations(jac: Float64Array, r: Float64Array, w: Float64Array, p: number): { a: Float64Array; g: Float64Array } {
	const m = r.length;
	const a = new Float64Array(p * p);
	const g = new Float64Array(p);
	for (let i = 0; i < m; i++) {
		const wi = w[i];
		const row = i * p;
		for (let j = 0; j < p; j++) {
			const wj = wi * jac[row + j];
			g[j] += wj * r[i];
			for (let k = j; k < p; k++) a[j * p + k] += wj * jac[row + k];
		}
	}
	for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) a[j * p + k] = a[k * p + j];
	return { a, g };
}

/** Cholesky factor L (lower, row-major) of a symmetric positive-definite n × n matrix; null if not positive definite. */
export function cholesky(a: ArrayLike<number>, n: number): Float64Array | null {
	const l = new Float64Array(n * n);
	for (let j = 0; j < n; j++) {
		let d = a[j * n + j];
		for (let k = 0; k < j; k++) d -= l[j * n + k] * l[j * n + k];
		if (!(d > 0)) return null;
		const ljj = Math.sqrt(d);
		l[j * n + j] = ljj;
		for (let i = j + 1; i < n; i++) {
			let s = a[i * n + j];
			for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
			l[i * n + j] = s / ljj;
		}
	}
	return l;
}

/** Solves L·Lᵀ·x = b. */
export function choleskySolve(l: Float64Array, b: ArrayLike<number>, n: number): Float64Array {
	const y = new Float64Array(n);
	for (let i = 0; i < n; i++) {
		let s = b[i];
		for (let k = 0; k < i; k++) s -= l[i * n + k] * y[k];
		y[i] = s / l[i * n + i];
	}
	const x = new Float64Array(n);
	for (let i = n - 1; i >= 0; i--) {
		let s = y[i];
		for (let k = i + 1; k < n; k++) s -= l[k * n + i] * x[k];
		x[i] = s / l[i * n + i];
	}
	return x;
}

/** Inverse of a symmetric positive-definite matrix, or null when it is singular to working precision. */
export function spdInverse(a: Float64Array, n: number): Float64Array | null {
	// Scale to unit diagonal first so the conditioning test does not depend on parameter units.
	const d = new Float64Array(n);
	for (let i = 0; i < n; i++) d[i] = Math.sqrt(a[i * n + i]);
	if (d.some((x) => !(x > 0))) return null;
	const s = new Float64Array(n * n);
	for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s[i * n + j] = a[i * n + j] / (d[i] * d[j]);
	const l = cholesky(s, n);
	if (!l) return null;
	let minPivot = Infinity;
	for (let i = 0; i < n; i++) minPivot = Math.min(minPivot, l[i * n + i]);
	// A pivot this small means a direction the data do not determine (correlation ≈ 1).
	if (minPivot < 1e-7) return null;
	const inv = new Float64Array(n * n);
	for (let j = 0; j < n; j++) {
		const e = new Float64Array(n);
		e[j] = 1;
		const col = choleskySolve(l, e, n);
		for (let i = 0; i < n; i++) inv[i * n + j] = col[i] / (d[i] * d[j]);
	}
	return inv;
}

export function levenbergMarquardt(f: ResidualFunction, theta0: readonly number[], options: LmOptions): LmResult {
	const p = theta0.length;
	const loss = options.loss ?? 'soft-l1';
	const fScale = options.fScale ?? 1;
	const maxIterations = options.maxIterations ?? 100;
	const costTol = options.costTolerance ?? 1e-12;
	const h = options.diffStep ?? 1e-6;
	const { lower, upper } = options;
	const clip = (x: number, k: number) => Math.min(upper[k], Math.max(lower[k], x));

	let theta = theta0.map(clip);
	let r = f(theta);
	let evaluations = 1;
	if (!allFinite(r)) throw new RangeError('the model has no finite value at the starting point');
	const m = r.length;
	const initialCost = robustCost(loss, r, fScale);
	let cost = initialCost;
	let lambda = 1e-3;
	let iterations = 0;
	let converged = false;
	let stop = 'iteration limit reached';
	const weightsOf = (res: Float64Array) => res.map((x) => lossWeight(loss, x * x, fScale));

	let jac = jacobianCentral(f, theta, m, h);
	evaluations += 2 * p;
	outer: while (iterations < maxIterations) {
		iterations++;
		const w = weightsOf(r);
		const { a, g } = normalEquations(jac, r, w, p);
		// Held: on a bound with the descent direction −g pointing out of the box.
		const free: number[] = [];
		for (let k = 0; k < p; k++) {
			const atLow = theta[k] <= lower[k] && g[k] > 0;
			const atHigh = theta[k] >= upper[k] && g[k] < 0;
			if (!atLow && !atHigh) free.push(k);
		}
		if (free.length === 0) {
			converged = true;
			stop = 'every parameter is held at a bound';
			break;
		}
		const n = free.length;
		for (let attempt = 0; attempt < 30; attempt++) {
			const sub = new Float64Array(n * n);
			const rhs = new Float64Array(n);
			for (let i = 0; i < n; i++) {
				rhs[i] = -g[free[i]];
				for (let j = 0; j < n; j++) sub[i * n + j] = a[free[i] * p + free[j]];
				sub[i * n + i] += lambda * Math.max(a[free[i] * p + free[i]], 1e-12);
			}
			const l = cholesky(sub, n);
			if (!l) {
				lambda *= 10;
				continue;
			}
			const step = choleskySolve(l, rhs, n);
			const trial = [...theta];
			for (let i = 0; i < n; i++) trial[free[i]] = clip(theta[free[i]] + step[i], free[i]);
			let moved = 0;
			for (let k = 0; k < p; k++) moved = Math.max(moved, Math.abs(trial[k] - theta[k]));
			if (moved < 1e-12) {
				converged = true;
				stop = 'step below 1e-12';
				break outer;
			}
			const rt = f(trial);
			evaluations++;
			const ct = allFinite(rt) ? robustCost(loss, rt, fScale) : Infinity;
			if (ct < cost) {
				const drop = (cost - ct) / Math.max(cost, 1e-300);
				theta = trial;
				r = rt;
				cost = ct;
				lambda = Math.max(lambda / 3, 1e-12);
				jac = jacobianCentral(f, theta, m, h);
				evaluations += 2 * p;
				if (drop < costTol) {
					converged = true;
					stop = 'relative cost change below tolerance';
					break outer;
				}
				continue outer;
			}
			lambda *= 4;
		}
		converged = true;
		stop = 'no step lowers the cost (a minimum to working precision)';
		break;
	}
	return { theta, initialCost, cost, residuals: r, jacobian: jac, weights: weightsOf(r), iterations, evaluations, converged, stop };
}
