/**
 * Roots of real polynomials (ascending coefficients, see polynomial.ts) up to degree ~16.
 * Method: scale s = k·x (k = |a0/an|^(1/n)) so the roots cluster around |x| = 1, start from
 * the Newton-polygon radii, iterate Aberth–Ehrlich, polish with Newton on the original
 * polynomial, then check the backward error. If it fails, fall back to the eigenvalues of
 * the scaled companion matrix (mathjs `eigs`, eigenvectors off) and keep the better set.
 * [published: O. Aberth, "Iteration methods for finding all zeros of a polynomial
 * simultaneously", Math. Comp. 27 (1973); D. A. Bini, "Numerical computation of polynomial
 * zeros by means of Aberth's method", Numer. Algorithms 13 (1996) — from memory]
 */
import { eigs } from 'mathjs';
import type { Complex } from './complex';
import { degree, type Poly } from './polynomial';

export interface RootsResult {
	roots: Complex[];
	/** Largest backward error max_i |p(r_i)| / Σ|a_k||r_i|^k (about 1e-16 is perfect). */
	backwardError: number;
	method: 'closed-form' | 'aberth' | 'companion';
}

/** Options; defaults in brackets. */
export interface RootsOptions {
	/** Give up Aberth after this many sweeps [500]. */
	maxIterations?: number;
	/** Accept Aberth when the backward error is below this [1e-11]. */
	acceptBackwardError?: number;
}

/** Roots of p (ascending coefficients). Roots at s = 0 are returned exactly as 0. */
export function polyRoots(p: Poly, options: RootsOptions = {}): RootsResult {
	const n = degree(p);
	if (n < 0) throw new Error('polyRoots: the zero polynomial has no defined roots');
	for (const c of p) if (!Number.isFinite(c)) throw new Error('polyRoots: non-finite coefficient');
	let low = 0;
	while (p[low] === 0) low++;
	const zeroRoots: Complex[] = [];
	for (let i = 0; i < low; i++) zeroRoots.push({ re: 0, im: 0 });
	const q = p.slice(low, n + 1); // q[0] ≠ 0, q[m] ≠ 0
	const m = q.length - 1;
	if (m === 0) return { roots: zeroRoots, backwardError: 0, method: 'closed-form' };
	if (m === 1) {
		return { roots: [...zeroRoots, { re: -q[0] / q[1], im: 0 }], backwardError: 0, method: 'closed-form' };
	}

	// Scale s = k·x and make the polynomial monic in x.
	const k = Math.pow(Math.abs(q[0] / q[m]), 1 / m);
	// b_i = q_i·k^(i−m)/q_m, powers by repeated multiplication (within m ulps of Math.pow).
	const b: number[] = [];
	for (let i = 0; i <= m; i++) b.push(0);
	b[m] = 1;
	let power = q[m];
	for (let i = m - 1; i >= 0; i--) {
		power *= k;
		b[i] = q[i] / power;
	}

	const maxIterations = options.maxIterations ?? 500;
	const accept = options.acceptBackwardError ?? 1e-11;
	const settled = scratch(2, b.length - 1);
	let xs = aberth(b, maxIterations, settled);
	let err = polishAll(b, xs, settled);
	let method: RootsResult['method'] = 'aberth';
	if (!(err <= accept)) {
		const alt = companionRoots(b);
		const altErr = polishAll(b, alt, null);
		if (altErr < err || !Number.isFinite(err)) {
			xs = alt;
			err = altErr;
			method = 'companion';
		}
	}
	for (const x of xs) {
		x.re *= k;
		x.im *= k;
	}
	const roots = conjugateSymmetric(xs);
	if (low === 0) return { roots, backwardError: err, method };
	return { roots: [...zeroRoots, ...roots], backwardError: err, method };
}

/** Initial radii from the upper convex hull of (i, log|b_i|) (Newton polygon). */
function initialGuesses(b: number[]): Complex[] {
	const m = b.length - 1;
	// Hull vertices as parallel arrays (index, log|b_i|).
	const hi: number[] = [];
	const hy: number[] = [];
	for (let i = 0; i <= m; i++) {
		if (b[i] === 0) continue;
		const y = Math.log(Math.abs(b[i]));
		while (hi.length >= 2) {
			const k = hi.length;
			// Remove the last vertex if it lies on or below the segment from the one before to (i, y).
			if ((hy[k - 1] - hy[k - 2]) * (i - hi[k - 2]) <= (y - hy[k - 2]) * (hi[k - 1] - hi[k - 2])) {
				hi.pop();
				hy.pop();
			} else break;
		}
		hi.push(i);
		hy.push(y);
	}
	const out: Complex[] = [];
	const sigma = 0.7; // angular offset so no start point sits on the real axis
	for (let h = 0; h + 1 < hi.length; h++) {
		const count = hi[h + 1] - hi[h];
		const radius = Math.exp((hy[h] - hy[h + 1]) / count);
		for (let j = 0; j < count; j++) {
			const angle = (2 * Math.PI * j) / count + (2 * Math.PI * h) / m + sigma;
			out.push({ re: radius * Math.cos(angle), im: radius * Math.sin(angle) });
		}
	}
	return out;
}

/** [Re p, Im p, Re p', Im p', Σ|b_k||x|^k] at the last evaluateAt call (see there). */
const at = new Float64Array(5);

/**
 * p(x), p'(x) and the rounding scale Σ|b_k||x|^k for real coefficients b at complex x, in one
 * Horner pass, written to `at` (no tuple to allocate on the roots' hot path).
 */
function evaluateAt(b: ArrayLike<number>, xr: number, xi: number): void {
	let pr = 0;
	let pi = 0;
	let dr = 0;
	let di = 0;
	let scale = 0;
	const ax = Math.sqrt(xr * xr + xi * xi);
	for (let k = b.length - 1; k >= 0; k--) {
		const ndr = dr * xr - di * xi + pr;
		di = dr * xi + di * xr + pi;
		dr = ndr;
		const npr = pr * xr - pi * xi + b[k];
		pi = pr * xi + pi * xr;
		pr = npr;
		scale = scale * ax + Math.abs(b[k]);
	}
	at[0] = pr;
	at[1] = pi;
	at[2] = dr;
	at[3] = di;
	at[4] = scale;
}

// Work arrays reused across calls (polyRoots is synchronous and calls nothing that re-enters
// it); typed arrays beyond a few elements are costly to allocate each time.
const work: Float64Array[] = [new Float64Array(16), new Float64Array(16), new Float64Array(16), new Float64Array(16)];

/** Work array `slot` with at least `size` entries (the first `size` are the caller's; no view is made). */
function scratch(slot: number, size: number): Float64Array {
	if (work[slot].length < size) work[slot] = new Float64Array(2 * size);
	return work[slot];
}

/**
 * Aberth–Ehrlich sweeps (Gauss–Seidel order: each update uses the newest neighbours). A root
 * stops once |p(z)| is at the level of the rounding error of evaluating p there
 * (|p(z)| ≤ 4ε·Σ|b_k||z|^k, Bini 1996) or its step is below 4ε·|z|; further sweeps could not
 * improve it and would only cost time.
 */
function aberth(b: number[], maxIterations: number, settled: Float64Array): Complex[] {
	const z0 = initialGuesses(b);
	const m = z0.length;
	const zr = scratch(0, m);
	const zi = scratch(1, m);
	for (let i = 0; i < m; i++) {
		zr[i] = z0[i].re;
		zi[i] = z0[i].im;
	}
	const done = scratch(3, m); // 0 or 1
	done.fill(0, 0, m);
	settled.fill(NaN, 0, m);
	let left = m;
	for (let iter = 0; iter < maxIterations && left > 0; iter++) {
		for (let i = 0; i < m; i++) {
			if (done[i]) continue;
			const xr = zr[i];
			const xi = zi[i];
			evaluateAt(b, xr, xi);
			const pr = at[0];
			const pi = at[1];
			const dr = at[2];
			const di = at[3];
			const bound = at[4];
			const ax = Math.sqrt(xr * xr + xi * xi);
			const pAbs = Math.sqrt(pr * pr + pi * pi);
			if (pAbs <= 4 * Number.EPSILON * bound) {
				// At the rounding level of p: Newton cannot improve it; its backward error is known.
				settled[i] = bound === 0 ? 0 : pAbs / bound;
				done[i] = 1;
				left--;
				continue;
			}
			// ratio = p/p'
			const dd = dr * dr + di * di;
			let rr: number;
			let ri: number;
			if (dd === 0) {
				rr = 1e-3 * (1 + ax);
				ri = rr;
			} else {
				rr = (pr * dr + pi * di) / dd;
				ri = (pi * dr - pr * di) / dd;
			}
			// sum = Σ 1/(z_i − z_j)
			let sr = 0;
			let si = 0;
			for (let j = 0; j < m; j++) {
				if (j === i) continue;
				const er = xr - zr[j];
				const ei = xi - zi[j];
				const e2 = er * er + ei * ei;
				if (e2 === 0) continue;
				sr += er / e2;
				si -= ei / e2;
			}
			// w = ratio / (1 − ratio·sum)
			const denR = 1 - (rr * sr - ri * si);
			const denI = -(rr * si + ri * sr);
			const den2 = denR * denR + denI * denI;
			const wr = den2 === 0 ? rr : (rr * denR + ri * denI) / den2;
			const wi = den2 === 0 ? ri : (ri * denR - rr * denI) / den2;
			zr[i] = xr - wr;
			zi[i] = xi - wi;
			if (Math.sqrt(wr * wr + wi * wi) <= 4e-16 * Math.sqrt(zr[i] * zr[i] + zi[i] * zi[i])) {
				done[i] = 1;
				left--;
			}
		}
	}
	const out: Complex[] = new Array(m);
	for (let i = 0; i < m; i++) out[i] = { re: zr[i], im: zi[i] };
	return out;
}

/**
 * A few Newton steps on each root in place, each kept only while it lowers |p|; returns the
 * largest backward error |p(x)| / Σ|b_i||x|^i over the roots (NaN propagates). Roots whose
 * backward error is already known (`settled[i]` finite: Aberth stopped them at the rounding
 * level) are left as they are.
 */
function polishAll(b: number[], xs: Complex[], settled: Float64Array | null): number {
	let worst = 0;
	for (let idx = 0; idx < xs.length; idx++) {
		const x = xs[idx];
		if (settled && Number.isFinite(settled[idx])) {
			if (!(settled[idx] <= worst)) worst = settled[idx];
			continue;
		}
		let xr = x.re;
		let xi = x.im;
		evaluateAt(b, xr, xi);
		let dr = at[2];
		let di = at[3];
		let scale = at[4];
		let best = Math.sqrt(at[0] * at[0] + at[1] * at[1]);
		for (let step = 0; step < 6 && best > 0; step++) {
			const dd = dr * dr + di * di;
			if (dd === 0) break;
			const yr = xr - (at[0] * dr + at[1] * di) / dd;
			const yi = xi - (at[1] * dr - at[0] * di) / dd;
			evaluateAt(b, yr, yi);
			const val = Math.sqrt(at[0] * at[0] + at[1] * at[1]);
			if (!(val < best)) break;
			xr = yr;
			xi = yi;
			dr = at[2];
			di = at[3];
			scale = at[4];
			best = val;
		}
		x.re = xr;
		x.im = xi;
		const e = scale === 0 ? 0 : best / scale;
		if (!(e <= worst)) worst = e; // NaN propagates as "worst"
	}
	return worst;
}

/** max over roots of |p(x)| / Σ |b_i| |x|^i. */
export function maxBackwardError(b: Poly, xs: readonly Complex[]): number {
	let worst = 0;
	for (const x of xs) {
		evaluateAt(b, x.re, x.im);
		const e = at[4] === 0 ? 0 : Math.hypot(at[0], at[1]) / at[4];
		if (!(e <= worst)) worst = e; // NaN propagates as "worst"
	}
	return worst;
}

/** Eigenvalues of the companion matrix of a monic polynomial b (ascending). */
function companionRoots(b: number[]): Complex[] {
	const m = b.length - 1;
	const rows: number[][] = [];
	for (let i = 0; i < m; i++) {
		const row = new Array<number>(m).fill(0);
		if (i === 0) for (let j = 0; j < m; j++) row[j] = -b[m - 1 - j];
		else row[i - 1] = 1;
		rows.push(row);
	}
	try {
		const res = eigs(rows, { eigenvectors: false, precision: 1e-10 }) as unknown as {
			values: unknown;
		};
		const raw = res.values as { toArray?: () => unknown[] } | unknown[];
		const list = (Array.isArray(raw) ? raw : (raw.toArray?.() ?? [])) as unknown[];
		return list.map((v) =>
			typeof v === 'number' ? { re: v, im: 0 } : { re: (v as Complex).re, im: (v as Complex).im }
		);
	} catch {
		return [];
	}
}

/**
 * Make a root set of a real polynomial exactly conjugate-symmetric: each root with im > 0
 * is matched with the nearest root with im < 0 and the pair is replaced by an exact
 * conjugate pair; unmatched roots become real.
 */
function conjugateSymmetric(roots: Complex[]): Complex[] {
	const out: Complex[] = [];
	const upper: Complex[] = [];
	const lower: Complex[] = [];
	for (const r of roots) {
		if (r.im > 0) upper.push(r);
		else if (r.im < 0) lower.push(r);
		else out.push({ re: r.re, im: 0 });
	}
	if (upper.length === 0 && lower.length === 0) return out;
	const used = new Array<boolean>(lower.length).fill(false);
	// Pair the most clearly complex roots first.
	if (upper.length > 1) upper.sort(byDecreasingImagRatio);
	for (const u of upper) {
		let best = -1;
		let bestD = Infinity;
		for (let j = 0; j < lower.length; j++) {
			if (used[j]) continue;
			const dr = u.re - lower[j].re;
			const di = u.im + lower[j].im;
			const d = Math.sqrt(dr * dr + di * di);
			if (d < bestD) {
				bestD = d;
				best = j;
			}
		}
		const scale = Math.hypot(u.re, u.im);
		if (best >= 0 && bestD <= 1e-6 * scale + Math.abs(u.im)) {
			used[best] = true;
			const l = lower[best];
			const re = (u.re + l.re) / 2;
			const im = (u.im - l.im) / 2;
			out.push({ re, im }, { re, im: -im });
		} else {
			out.push({ re: u.re, im: 0 });
		}
	}
	for (let j = 0; j < lower.length; j++) if (!used[j]) out.push({ re: lower[j].re, im: 0 });
	return out;
}

function byDecreasingImagRatio(a: Complex, b: Complex): number {
	return b.im / Math.hypot(b.re, b.im) - a.im / Math.hypot(a.re, a.im);
}
