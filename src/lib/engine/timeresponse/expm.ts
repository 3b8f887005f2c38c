/**
 * Matrix exponential by scaling and squaring with the degree-13 Padé approximant
 * [published: N. J. Higham, "The scaling and squaring method for the matrix exponential
 * revisited", SIAM J. Matrix Anal. Appl. 26(4), 2005 — coefficients and θ13 from memory].
 * Written here because mathjs `expm` gives up on stiff matrices (‖A·h‖ of 10³…10⁴, from
 * capacitor ESL poles next to a slow loop). Dense row-major n×n Float64Array.
 */

const B13 = [
	64764752532480000, 32382376266240000, 7771770303897600, 1187353796428800, 129060195264000, 10559470521600,
	670442572800, 33522128640, 1323241920, 40840800, 960960, 16380, 182, 1
];
const THETA13 = 5.371920351148152;

export function matMul(a: Float64Array, b: Float64Array, n: number): Float64Array {
	const out = new Float64Array(n * n);
	for (let i = 0; i < n; i++) {
		for (let k = 0; k < n; k++) {
			const aik = a[i * n + k];
			if (aik === 0) continue;
			for (let j = 0; j < n; j++) out[i * n + j] += aik * b[k * n + j];
		}
	}
	return out;
}

function norm1(a: Float64Array, n: number): number {
	let best = 0;
	for (let j = 0; j < n; j++) {
		let s = 0;
		for (let i = 0; i < n; i++) s += Math.abs(a[i * n + j]);
		best = Math.max(best, s);
	}
	return best;
}

/** Solve P·X = Q for X (n×n), Gaussian elimination with partial pivoting. */
function solve(p: Float64Array, q: Float64Array, n: number): Float64Array {
	const a = Float64Array.from(p);
	const x = Float64Array.from(q);
	for (let col = 0; col < n; col++) {
		let piv = col;
		for (let r = col + 1; r < n; r++) if (Math.abs(a[r * n + col]) > Math.abs(a[piv * n + col])) piv = r;
		if (a[piv * n + col] === 0) throw new RangeError('expm: singular Padé denominator');
		if (piv !== col) {
			for (let j = 0; j < n; j++) {
				[a[col * n + j], a[piv * n + j]] = [a[piv * n + j], a[col * n + j]];
				[x[col * n + j], x[piv * n + j]] = [x[piv * n + j], x[col * n + j]];
			}
		}
		const d = a[col * n + col];
		for (let r = col + 1; r < n; r++) {
			const f = a[r * n + col] / d;
			if (f === 0) continue;
			for (let j = col; j < n; j++) a[r * n + j] -= f * a[col * n + j];
			for (let j = 0; j < n; j++) x[r * n + j] -= f * x[col * n + j];
		}
	}
	for (let col = n - 1; col >= 0; col--) {
		const d = a[col * n + col];
		for (let j = 0; j < n; j++) x[col * n + j] /= d;
		for (let r = 0; r < col; r++) {
			const f = a[r * n + col];
			if (f === 0) continue;
			for (let j = 0; j < n; j++) x[r * n + j] -= f * x[col * n + j];
		}
	}
	return x;
}

/** e^A for a dense n×n matrix (row-major). */
export function expm(aIn: Float64Array, n: number): Float64Array {
	const nrm = norm1(aIn, n);
	if (!Number.isFinite(nrm)) throw new RangeError('expm: non-finite matrix');
	const s = nrm > THETA13 ? Math.ceil(Math.log2(nrm / THETA13)) : 0;
	const f = Math.pow(2, -s);
	const a = aIn.map((v) => v * f);
	const eye = new Float64Array(n * n);
	for (let i = 0; i < n; i++) eye[i * n + i] = 1;
	const a2 = matMul(a, a, n);
	const a4 = matMul(a2, a2, n);
	const a6 = matMul(a4, a2, n);
	const lin = (terms: [number, Float64Array][]) => {
		const out = new Float64Array(n * n);
		for (const [c, m] of terms) for (let i = 0; i < out.length; i++) out[i] += c * m[i];
		return out;
	};
	const b = B13;
	const u = matMul(
		a,
		lin([
			[1, matMul(a6, lin([[b[13], a6], [b[11], a4], [b[9], a2]]), n)],
			[b[7], a6],
			[b[5], a4],
			[b[3], a2],
			[b[1], eye]
		]),
		n
	);
	const v = lin([
		[1, matMul(a6, lin([[b[12], a6], [b[10], a4], [b[8], a2]]), n)],
		[b[6], a6],
		[b[4], a4],
		[b[2], a2],
		[b[0], eye]
	]);
	const p = lin([[1, v], [-1, u]]);
	const q = lin([[1, v], [1, u]]);
	let r = solve(p, q, n);
	for (let k = 0; k < s; k++) r = matMul(r, r, n);
	return r;
}
