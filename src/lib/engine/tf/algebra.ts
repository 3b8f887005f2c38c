/**
 * Algebra on factored transfer functions: products, quotients, inverses and scaling keep
 * the factored form (factor lists are concatenated, gains multiplied, delays added), so no
 * precision is lost by expanding polynomials. Conventions: see types.ts.
 */
import type { FactoredTf, Root } from './types';

export function multiply(...tfs: FactoredTf[]): FactoredTf {
	let gain = 1;
	let originPower = 0;
	let delayS = 0;
	const zeros: Root[] = [];
	const poles: Root[] = [];
	for (const t of tfs) {
		gain *= t.gain;
		originPower += t.originPower;
		delayS += t.delayS ?? 0;
		zeros.push(...t.zeros);
		poles.push(...t.poles);
	}
	return delayS === 0 ? { gain, originPower, zeros, poles } : { gain, originPower, zeros, poles, delayS };
}

/** 1/T. Throws on a zero gain. A delay becomes a negative (non-causal) delay. */
export function invert(t: FactoredTf): FactoredTf {
	if (t.gain === 0) throw new Error('invert: transfer function is identically zero');
	const out: FactoredTf = { gain: 1 / t.gain, originPower: -t.originPower, zeros: [...t.poles], poles: [...t.zeros] };
	if (t.delayS) out.delayS = -t.delayS;
	return out;
}

export function divide(a: FactoredTf, b: FactoredTf): FactoredTf {
	return multiply(a, invert(b));
}

export function scale(t: FactoredTf, k: number): FactoredTf {
	return { ...t, gain: t.gain * k, zeros: [...t.zeros], poles: [...t.poles] };
}

export function withDelay(t: FactoredTf, delayS: number): FactoredTf {
	return { ...t, delayS: (t.delayS ?? 0) + delayS };
}

function sameRoot(a: Root, b: Root, relTol: number): boolean {
	if (a.kind === 'real' && b.kind === 'real') return Math.abs(a.omega - b.omega) <= relTol * Math.abs(a.omega);
	if (a.kind === 'pair' && b.kind === 'pair') {
		const w = Math.abs(a.omega0 - b.omega0) <= relTol * a.omega0;
		const qa = 1 / a.q;
		const qb = 1 / b.q;
		return w && Math.abs(qa - qb) <= relTol * Math.max(Math.abs(qa), Math.abs(qb), 1e-300) + 1e-15;
	}
	return false;
}

/** Remove zero/pole factors that coincide within relTol (default 1e-12). */
export function cancelCommon(t: FactoredTf, relTol = 1e-12): FactoredTf {
	const poles = [...t.poles];
	const zeros: Root[] = [];
	for (const z of t.zeros) {
		const idx = poles.findIndex((p) => sameRoot(z, p, relTol));
		if (idx >= 0) poles.splice(idx, 1);
		else zeros.push(z);
	}
	return { ...t, zeros, poles };
}
