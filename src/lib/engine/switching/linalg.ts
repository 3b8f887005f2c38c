/**
 * Small dense linear algebra for the switching simulator: row-major n×n Float64Array matrices as
 * in timeresponse/expm.ts, vectors as Float64Array. LU with partial pivoting for repeated solves,
 * and e^(A·δ)·x by its Taylor series for the short steps that place a switching instant
 * (‖A·δ‖ kept ≤ 1 by sub-steps, so the series converges to rounding in about 20 terms).
 */

export function matVec(a: Float64Array, x: Float64Array, n: number, out = new Float64Array(n)): Float64Array {
	for (let i = 0; i < n; i++) {
		let s = 0;
		const row = i * n;
		for (let j = 0; j < n; j++) s += a[row + j] * x[j];
		out[i] = s;
	}
	return out;
}

/** Dense n×n product (the one in timeresponse/expm.ts). */
export { matMul } from '../timeresponse/expm';

export function identity(n: number): Float64Array {
	const m = new Float64Array(n * n);
	for (let i = 0; i < n; i++) m[i * n + i] = 1;
	return m;
}

/** The leading k×k block of an n×n matrix. */
export function leadingBlock(a: Float64Array, n: number, k: number): Float64Array {
	const out = new Float64Array(k * k);
	for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) out[i * k + j] = a[i * n + j];
	return out;
}

export interface Lu {
	n: number;
	lu: Float64Array;
	pivot: Int32Array;
}

/** LU factorisation with partial pivoting; throws on an exactly singular matrix. */
export function luFactor(a: Float64Array, n: number): Lu {
	const lu = Float64Array.from(a);
	const pivot = new Int32Array(n);
	for (let col = 0; col < n; col++) {
		let p = col;
		for (let r = col + 1; r < n; r++) if (Math.abs(lu[r * n + col]) > Math.abs(lu[p * n + col])) p = r;
		pivot[col] = p;
		if (lu[p * n + col] === 0) throw new RangeError('singular matrix');
		if (p !== col) {
			for (let j = 0; j < n; j++) {
				const t = lu[col * n + j];
				lu[col * n + j] = lu[p * n + j];
				lu[p * n + j] = t;
			}
		}
		const d = lu[col * n + col];
		for (let r = col + 1; r < n; r++) {
			const f = (lu[r * n + col] /= d);
			if (f === 0) continue;
			for (let j = col + 1; j < n; j++) lu[r * n + j] -= f * lu[col * n + j];
		}
	}
	return { n, lu, pivot };
}

/** Solve A·x = b with a factorisation of A. */
export function luSolve({ n, lu, pivot }: Lu, b: Float64Array): Float64Array {
	const x = Float64Array.from(b);
	for (let i = 0; i < n; i++) {
		const p = pivot[i];
		if (p !== i) {
			const t = x[i];
			x[i] = x[p];
			x[p] = t;
		}
	}
	for (let i = 0; i < n; i++) {
		let s = x[i];
		for (let j = 0; j < i; j++) s -= lu[i * n + j] * x[j];
		x[i] = s;
	}
	for (let i = n - 1; i >= 0; i--) {
		let s = x[i];
		for (let j = i + 1; j < n; j++) s -= lu[i * n + j] * x[j];
		x[i] = s / lu[i * n + i];
	}
	return x;
}

/** aᵀ·x over the length of a. */
export function dot(a: Float64Array, x: Float64Array): number {
	let s = 0;
	for (let i = 0; i < a.length; i++) s += a[i] * x[i];
	return s;
}
