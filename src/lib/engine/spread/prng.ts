/**
 * Seeded pseudo-random numbers so a Monte Carlo run reproduces exactly: xoshiro128** seeded
 * through splitmix32 [published: D. Blackman, S. Vigna, "Scrambled linear pseudorandom number
 * generators", ACM TOMS 47(4), 2021; splitmix from Steele, Lea, Flood, OOPSLA 2014 — constants
 * from memory], normal deviates by the Box–Muller transform [published: Box & Muller, Ann. Math.
 * Statist. 29, 1958].
 */
export interface Rng {
	/** Uniform in [0, 1). */
	next(): number;
	/** Standard normal. */
	normal(): number;
}

function splitmix32(seed: number): () => number {
	let s = seed >>> 0;
	return () => {
		s = (s + 0x9e3779b9) >>> 0;
		let z = s;
		z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
		z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
		return (z ^ (z >>> 16)) >>> 0;
	};
}

export function createRng(seed: number): Rng {
	const sm = splitmix32(Math.floor(seed));
	let a = sm();
	let b = sm();
	let c = sm();
	let d = sm();
	if ((a | b | c | d) === 0) a = 1;
	const nextU32 = () => {
		const result = Math.imul(rotl(Math.imul(b, 5) >>> 0, 7), 9) >>> 0;
		const t = (b << 9) >>> 0;
		c = (c ^ a) >>> 0;
		d = (d ^ b) >>> 0;
		b = (b ^ c) >>> 0;
		a = (a ^ d) >>> 0;
		c = (c ^ t) >>> 0;
		d = rotl(d, 11);
		return result;
	};
	let spare: number | null = null;
	const next = () => nextU32() / 4294967296;
	return {
		next,
		normal() {
			if (spare !== null) {
				const v = spare;
				spare = null;
				return v;
			}
			let u = 0;
			while (u === 0) u = next();
			const v = next();
			const r = Math.sqrt(-2 * Math.log(u));
			spare = r * Math.sin(2 * Math.PI * v);
			return r * Math.cos(2 * Math.PI * v);
		}
	};
}

const rotl = (x: number, k: number) => ((x << k) | (x >>> (32 - k))) >>> 0;
