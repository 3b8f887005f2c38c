/**
 * Scalar root finding and minimisation on a bracket: Brent's method (inverse quadratic
 * interpolation with bisection safeguard) and golden-section search.
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

/** Minimiser of a unimodal f on [a, b] by golden-section search. */
export function goldenMin(f: (x: number) => number, a: number, b: number, xtol = 1e-10): { x: number; fx: number } {
	const g = (Math.sqrt(5) - 1) / 2;
	let x1 = b - g * (b - a);
	let x2 = a + g * (b - a);
	let f1 = f(x1);
	let f2 = f(x2);
	for (let i = 0; i < 200 && Math.abs(b - a) > xtol * Math.max(1, Math.abs(a) + Math.abs(b)); i++) {
		if (f1 < f2) {
			b = x2;
			x2 = x1;
			f2 = f1;
			x1 = b - g * (b - a);
			f1 = f(x1);
		} else {
			a = x1;
			x1 = x2;
			f1 = f2;
			x2 = a + g * (b - a);
			f2 = f(x2);
		}
	}
	return f1 < f2 ? { x: x1, fx: f1 } : { x: x2, fx: f2 };
}
