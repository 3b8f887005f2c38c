/**
 * Output network of the averaged models: load R in parallel with a bank of capacitor branches.
 * A branch of n parts (c, esr, esl) equals one part (n·c, esr/n, esl/n); its impedance is
 * q_b(s)/(s·C_b) with q_b = 1 + s·C_b·R_b + s²·C_b·L_b. Branches with the same q_b merge exactly.
 * Then Zp = R·Q/(Q + R·S), Q = Π q_b, S = Σ s·C_b·Π_{j≠b} q_j (ascending polynomials) [derived here].
 */
import { polyAdd, polyMul, polyProduct, polyScale, polyShift } from '../math/polynomial';
import { pairRoot, realRoot, type Root } from '../tf/types';
import type { CapacitorBranch } from './types';

export interface EquivalentBranch {
	/** Total capacitance n·c, series resistance esr/n, series inductance esl/n. */
	c: number;
	esr: number;
	esl: number;
}

/** Combine parts per branch and merge branches with identical time constants. */
export function equivalentBranches(bank: readonly CapacitorBranch[]): EquivalentBranch[] {
	const out: EquivalentBranch[] = [];
	for (const b of bank) {
		const e = { c: b.c * b.count, esr: b.esr / b.count, esl: b.esl / b.count };
		const same = out.find(
			(o) => close(o.c * o.esr, e.c * e.esr) && close(o.c * o.esl, e.c * e.esl)
		);
		if (same) {
			// Parallel branches with equal q(s): capacitances add, ESR and ESL scale down.
			const ct = same.c + e.c;
			same.esr = (same.esr * same.c) / ct;
			same.esl = (same.esl * same.c) / ct;
			same.c = ct;
		} else out.push(e);
	}
	return out;
}

const close = (a: number, b: number) => Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b));

/** q_b(s) as an ascending polynomial. */
export const branchPoly = (b: EquivalentBranch): number[] =>
	b.esl > 0 ? [1, b.c * b.esr, b.c * b.esl] : [1, b.c * b.esr];

/** The zero factor(s) of q_b, or none when ESR = ESL = 0. */
export function branchZeroFactors(b: EquivalentBranch): Root[] {
	if (b.esl > 0) {
		const omega0 = 1 / Math.sqrt(b.c * b.esl);
		// 1 + s·C·R + s²·C·L  ⇒  1/(q·ω0) = C·R  ⇒  q = 1/(C·R·ω0)
		const q = b.esr > 0 ? 1 / (b.c * b.esr * omega0) : Infinity;
		return [pairRoot(omega0, q)];
	}
	return b.esr > 0 ? [realRoot(1 / (b.c * b.esr))] : [];
}

export interface OutputNetwork {
	branches: EquivalentBranch[];
	/** Q(s) = Π q_b, ascending, Q(0) = 1. */
	qPoly: number[];
	/** S(s) = Σ s·C_b·Π_{j≠b} q_j, ascending, S(0) = 0. */
	sPoly: number[];
	/** Zeros of Q(s), one group per branch. */
	qFactors: Root[];
	/** Total capacitance, F. */
	cTotal: number;
}

export function outputNetwork(bank: readonly CapacitorBranch[]): OutputNetwork {
	const branches = equivalentBranches(bank);
	const polys: number[][] = [];
	const qFactors: Root[] = [];
	let cTotal = 0;
	for (const b of branches) {
		polys.push(branchPoly(b));
		for (const f of branchZeroFactors(b)) qFactors.push(f);
		cTotal += b.c;
	}
	let sPoly: number[] = [0];
	for (let i = 0; i < branches.length; i++) {
		// s·C_i·Π_{j≠i} q_j
		let others: number[] = [1];
		for (let j = 0; j < polys.length; j++) if (j !== i) others = polyMul(others, polys[j]);
		sPoly = polyAdd(sPoly, polyShift(polyScale(others, branches[i].c), 1));
	}
	return { branches, qPoly: polyProduct(polys), sPoly, qFactors, cTotal };
}

/** Complex impedance of the capacitor bank alone at angular frequency omega: [re, im]. */
export function bankImpedance(branches: readonly EquivalentBranch[], omega: number): [number, number] {
	let yr = 0;
	let yi = 0;
	for (const b of branches) {
		const zr = b.esr;
		const zi = omega * b.esl - 1 / (omega * b.c);
		const m = zr * zr + zi * zi;
		yr += zr / m;
		yi -= zi / m;
	}
	const m = yr * yr + yi * yi;
	return [yr / m, -yi / m];
}

/** (r + sL)·(Q + R·S) + k·R·Q — the shared denominator of every transfer function. */
export function stageDenominator(net: OutputNetwork, r: number, l: number, rLoad: number, k: number): number[] {
	const qrs = polyAdd(net.qPoly, polyScale(net.sPoly, rLoad));
	return polyAdd(polyMul([r, l], qrs), polyScale(net.qPoly, k * rLoad));
}
