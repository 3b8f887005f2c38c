/**
 * Scalar root finding and minimisation on a bracket: Brent's root finder (inverse quadratic
 * interpolation with bisection safeguard), Brent's minimiser (parabolic interpolation with a
 * golden-section safeguard) and a bracketed Newton for functions with a known derivative.
 * [published: R. P. Brent, "Algorithms for Minimization without Derivatives", 1973, ch. 4–5]
 */

/** Root of f in [a, b] where f(a)·f(b) ≤ 0. Returns the abscissa. */
export function brentRoot(f: (x: number) => number, a: number, b: number, fa = f(a), fb = f(b), xtol = 1e-13): number {
	if (fa === 0) return a;
	if (fb === 0) return b;
	if (fa * fb > 0) throw new Error('brentRoot: root not bracketed');
	let c = a;
	let fc = fa;
	let d = b - a;
	let e = d;
	for (let iter = 0; iter < 200; iter++) {
		if (fb * fc > 0) {
			c = a;
			fc = fa;
			d = b - a;
			e = d;
		}
		if (Math.abs(fc) < Math.abs(fb)) {
			a = b;
			b = c;
			c = a;
			fa = fb;
			fb = fc;
			fc = fa;
		}
		const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * xtol * Math.max(1, Math.abs(b));
		const m = 0.5 * (c - b);
		if (Math.abs(m) <= tol || fb === 0) return b;
		if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
			const s = fb / fa;
			let p: number;
			let q: number;
			if (a === c) {
				p = 2 * m * s;
				q = 1 - s;
			} else {
				const qa = fa / fc;
				const r = fb / fc;
				p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
				q = (qa - 1) * (r - 1) * (s - 1);
			}
			if (p > 0) q = -q;
			else p = -p;
			if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
				e = d;
				d = p / q;
			} else {
				d = m;
				e = m;
			}
		} else {
			d = m;
			e = m;
		}
		a = b;
		fa = fb;
		b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
		fb = f(b);
	}
	return b;
}

/**
 * Minimiser of f on [a, b] by Brent's method (parabolic interpolation, golden-section
 * safeguard); converges superlinearly on smooth f and never evaluates the ends. `xtol` is an
 * absolute tolerance on x (a relative √ε·|x| is added). [published: Brent 1973, ch. 5]
 */
export function brentMin(f: (x: number) => number, a: number, b: number, xtol = 1e-10): { x: number; fx: number } {
	const golden = (3 - Math.sqrt(5)) / 2;
	const sqrtEps = Math.sqrt(Number.EPSILON);
	let x = a + golden * (b - a);
	let w = x;
	let v = x;
	let fx = f(x);
	let fw = fx;
	let fv = fx;
	let d = 0;
	let e = 0;
	for (let iter = 0; iter < 200; iter++) {
		const mid = 0.5 * (a + b);
		const tol1 = sqrtEps * Math.abs(x) + xtol / 3;
		const tol2 = 2 * tol1;
		if (Math.abs(x - mid) <= tol2 - 0.5 * (b - a)) break;
		let parabolic = false;
		if (Math.abs(e) > tol1) {
			let r = (x - w) * (fx - fv);
			let q = (x - v) * (fx - fw);
			let p = (x - v) * q - (x - w) * r;
			q = 2 * (q - r);
			if (q > 0) p = -p;
			else q = -q;
			r = e;
			e = d;
			if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
				d = p / q;
				const u = x + d;
				if (u - a < tol2 || b - u < tol2) d = x < mid ? tol1 : -tol1;
				parabolic = true;
			}
		}
		if (!parabolic) {
			e = (x < mid ? b : a) - x;
			d = golden * e;
		}
		const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1);
		const fu = f(u);
		if (fu <= fx) {
			if (u < x) b = x;
			else a = x;
			v = w;
			fv = fw;
			w = x;
			fw = fx;
			x = u;
			fx = fu;
		} else {
			if (u < x) a = u;
			else b = u;
			if (fu <= fw || w === x) {
				v = w;
				fv = fw;
				w = u;
				fw = fu;
			} else if (fu <= fv || v === x || v === w) {
				v = u;
				fv = fu;
			}
		}
	}
	return { x, fx };
}

/**
 * Root of f in [a, b] (f(a)·f(b) ≤ 0) by Newton's method kept inside the shrinking bracket,
 * falling back to bisection when a step leaves it or does not halve the error; `fdf(x, out)`
 * writes f(x) to out[0] and f'(x) to out[1] (fdf must not itself call newtonBracketed). Same
 * tolerance convention as brentRoot.
 * [published: W. H. Press et al., Numerical Recipes, "rtsafe" (Newton with bisection); from memory]
 */
// Reused by newtonBracketed (synchronous; fdf must not call newtonBracketed itself).
const newtonScratch = new Float64Array(2);

export function newtonBracketed(
	fdf: (x: number, out: Float64Array) => void,
	a: number,
	b: number,
	fa: number,
	fb: number,
	xtol = 1e-13
): number {
	if (fa === 0) return a;
	if (fb === 0) return b;
	if (fa * fb > 0) throw new Error('newtonBracketed: root not bracketed');
	// Orient so that f(lo) < 0 < f(hi).
	let lo = fa < 0 ? a : b;
	let hi = fa < 0 ? b : a;
	const out = newtonScratch;
	// Start from the secant point: the function is monotone on the bracket in practice.
	let x = a - (fa * (b - a)) / (fb - fa);
	if (!(x > Math.min(a, b) && x < Math.max(a, b))) x = 0.5 * (a + b);
	let stepOld = Math.abs(b - a);
	let step = stepOld;
	for (let iter = 0; iter < 100; iter++) {
		fdf(x, out);
		const f = out[0];
		const df = out[1];
		if (f === 0) return x;
		if (f < 0) lo = x;
		else hi = x;
		const tol = 2 * Number.EPSILON * Math.abs(x) + 0.5 * xtol * Math.max(1, Math.abs(x));
		const dx = f / df;
		// A Newton step below the tolerance means x is the root to working precision.
		if (Math.abs(dx) <= tol) return x - dx;
		const xn = x - dx;
		const inside = (xn - lo) * (xn - hi) < 0;
		if (!inside || !Number.isFinite(xn) || Math.abs(2 * f) > Math.abs(stepOld * df)) {
			stepOld = step;
			step = 0.5 * (hi - lo);
			x = lo + step;
			step = Math.abs(step);
			if (step <= tol) return x;
		} else {
			stepOld = step;
			step = Math.abs(xn - x);
			x = xn;
			if (step <= tol) return x;
		}
	}
	return x;
}
