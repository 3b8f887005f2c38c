/**
 * Real polynomials as plain coefficient arrays in ASCENDING powers: p[i] multiplies s^i,
 * so [1, 2, 3] is 1 + 2s + 3s². This is the only order used inside the engine; convert at
 * the boundary (scipy/numpy use descending order) with `toDescending`/`fromDescending`.
 */

/** Coefficients in ascending powers: p[i] multiplies s^i. */
export type Poly = readonly number[];

/** Degree after dropping zero high-order coefficients (−1 for the zero polynomial). */
export function degree(p: Poly): number {
	for (let i = p.length - 1; i >= 0; i--) if (p[i] !== 0) return i;
	return -1;
}

/** The same polynomial without zero high-order coefficients. */
export function trim(p: Poly): number[] {
	return p.slice(0, degree(p) + 1);
}

/** n zeros in a packed array (new Array(n).fill(0) gives a holey one, slower to use in V8). */
function zeros(n: number): number[] {
	const out: number[] = [];
	for (let i = 0; i < n; i++) out.push(0);
	return out;
}

export function polyAdd(a: Poly, b: Poly): number[] {
	const out = zeros(Math.max(a.length, b.length));
	for (let i = 0; i < a.length; i++) out[i] += a[i];
	for (let i = 0; i < b.length; i++) out[i] += b[i];
	return out;
}

export function polyScale(a: Poly, k: number): number[] {
	return a.map((c) => c * k);
}

export function polyMul(a: Poly, b: Poly): number[] {
	if (a.length === 0 || b.length === 0) return [];
	const out = zeros(a.length + b.length - 1);
	for (let i = 0; i < a.length; i++) {
		if (a[i] === 0) continue;
		for (let j = 0; j < b.length; j++) out[i + j] += a[i] * b[j];
	}
	return out;
}

/** Product of many polynomials; the empty product is [1]. */
export function polyProduct(factors: readonly Poly[]): number[] {
	let out: number[] = [1];
	for (const f of factors) out = polyMul(out, f);
	return out;
}

/** Multiply by s^n (n ≥ 0). */
export function polyShift(a: Poly, n: number): number[] {
	const out = zeros(n);
	for (let i = 0; i < a.length; i++) out.push(a[i]);
	return out;
}

/** Substitute s = k·x: returns coefficients in x. */
export function polySubstituteScale(a: Poly, k: number): number[] {
	let kp = 1;
	return a.map((c) => {
		const v = c * kp;
		kp *= k;
		return v;
	});
}

/** Evaluate a real polynomial at a real point (Horner). */
export function polyEvalReal(p: Poly, x: number): number {
	let acc = 0;
	for (let i = p.length - 1; i >= 0; i--) acc = acc * x + p[i];
	return acc;
}

/** Evaluate a real polynomial at a complex point (Horner); returns [re, im]. */
export function polyEvalComplex(p: Poly, re: number, im: number): [number, number] {
	let ar = 0;
	let ai = 0;
	for (let i = p.length - 1; i >= 0; i--) {
		const nr = ar * re - ai * im + p[i];
		ai = ar * im + ai * re;
		ar = nr;
	}
	return [ar, ai];
}

/** Convert from descending order (numpy/scipy: p[0] multiplies the highest power). */
export function fromDescending(p: readonly number[]): number[] {
	return [...p].reverse();
}

/** Convert to descending order (numpy/scipy). */
export function toDescending(p: Poly): number[] {
	return [...trim(p)].reverse();
}
