/**
 * The exact averaged small-signal transfer functions of the VM CCM buck and boost with a
 * general output-capacitor bank (docs/formulas.md §1.3, §2.3; bank generalisation derived here):
 *   common denominator Δ = (r + sL)(Q + R·S) + k·R·Q, k = 1 (buck) or D'² (boost);
 *   buck:  Gvd = Vg·R·Q/Δ, Gvg = D·R·Q/Δ, Zo = R(r + sL)Q/Δ, ZD = Δ/(D²(Q + R·S)), ZN = −(R + r)/D²
 *   boost: Gvd = R·IL·(D'²R − r − sL)·Q/Δ, Gvg = D'·R·Q/Δ, Zo = R(r + sL)Q/Δ,
 *          ZD = Δ/(Q + R·S), ZN = −(D'²R − r − sL).
 * With one branch and no ESL these are exactly the closed forms of the formula sheet.
 */
import { polyAdd, polyScale } from '../math/polynomial';
import { realRoot, type FactoredTf, type Root } from '../tf/types';
import { outputNetwork, stageDenominator, type OutputNetwork } from './capacitorBank';
import { factorNormalised } from './factorPoly';
import type { PlantFeatures } from './types';

export interface StageParameters {
	topology: 'buck' | 'boost';
	vin: number;
	vout: number;
	duty: number;
	rLoad: number;
	rSeries: number;
	l: number;
	inductorCurrent: number;
}

export interface StageTransferFunctions {
	gvd: FactoredTf;
	gvg: FactoredTf;
	zo: FactoredTf;
	zd: FactoredTf;
	zn: FactoredTf;
	network: OutputNetwork;
	/** Poles shared by Gvd, Gvg and Zo. */
	poles: Root[];
}

/**
 * The boost's right-half-plane zero, rad/s: ωrhp = (D′²·R − r)/L (docs/formulas.md §2.3; lossless
 * D′²R/L [published: E&M Table 8.2, recalled]). The one definition: the plant's Gvd, its features
 * and the crossover rule (compensators/crossoverLimit.ts) all use it.
 */
export function boostRhpZeroOmega(p: { dPrime: number; rLoad: number; rSeries: number; l: number }): number {
	return (p.dPrime * p.dPrime * p.rLoad - p.rSeries) / p.l;
}

const tf = (gain: number, zeros: Root[], poles: Root[], originPower = 0): FactoredTf => ({
	gain,
	originPower,
	zeros,
	poles
});

export function stageTransferFunctions(p: StageParameters, net: OutputNetwork): StageTransferFunctions {
	const { rLoad: R, rSeries: r, l: L } = p;
	const dc = 1 - p.duty;
	const k = p.topology === 'buck' ? 1 : dc * dc;
	const delta = stageDenominator(net, r, L, R, k);
	const delta0 = delta[0]; // r + k·R
	const poles = factorNormalised(delta);
	const qz = net.qFactors;

	// (r + sL): a zero at r/L, or a zero at the origin when r = 0.
	const zoTf =
		r > 0 ? tf((R * r) / delta0, [realRoot(r / L), ...qz], poles) : tf((R * L) / delta0, [...qz], poles, 1);

	// Q + R·S: the load in parallel with the bank, the poles of ZD.
	const qrs = polyAdd(net.qPoly, polyScale(net.sPoly, R));
	const zdPoles = factorNormalised(qrs);

	if (p.topology === 'buck') {
		const d2 = p.duty * p.duty;
		return {
			gvd: tf((p.vin * R) / delta0, [...qz], poles),
			gvg: tf((p.duty * R) / delta0, [...qz], poles),
			zo: zoTf,
			zd: tf(delta0 / d2, [...poles], zdPoles),
			zn: tf(-(R + r) / d2, [], []),
			network: net,
			poles
		};
	}
	const gap = dc * dc * R - r; // D'²R − r > 0, checked by the operating point
	const rhp = realRoot(-boostRhpZeroOmega({ dPrime: dc, rLoad: R, rSeries: r, l: L }));
	return {
		gvd: tf((R * p.inductorCurrent * gap) / delta0, [...qz, rhp], poles),
		gvg: tf((dc * R) / delta0, [...qz], poles),
		zo: zoTf,
		zd: tf(delta0, [...poles], zdPoles),
		zn: tf(-gap, [rhp], []),
		network: net,
		poles
	};
}

/** f0 and Q of the lowest resonance among the poles (two lowest real poles count as one pair). */
export function dominantResonance(poles: readonly Root[]): { omega0: number; q: number } {
	// The two lowest by corner frequency (ties keep list order, as a stable sort would).
	let first: Root | undefined;
	let second: Root | undefined;
	for (const r of poles) {
		if (!first || mag(r) < mag(first)) {
			second = first;
			first = r;
		} else if (!second || mag(r) < mag(second)) second = r;
	}
	if (!first) return { omega0: 0, q: 0 };
	if (first.kind === 'pair') return { omega0: first.omega0, q: first.q };
	if (!second) return { omega0: Math.abs(first.omega), q: 0 };
	if (second.kind === 'pair') return { omega0: second.omega0, q: second.q };
	const w1 = Math.abs(first.omega);
	const w2 = Math.abs(second.omega);
	return { omega0: Math.sqrt(w1 * w2), q: Math.sqrt(w1 * w2) / (w1 + w2) };
}

const mag = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0);

function ascending(a: number, b: number): number {
	return a - b;
}

export function stageFeatures(p: StageParameters, t: StageTransferFunctions): PlantFeatures {
	const { omega0, q } = dominantResonance(t.poles);
	const esrZeroHz: number[] = [];
	const selfResonanceHz: number[] = [];
	for (const b of t.network.branches) {
		const fz = 1 / (2 * Math.PI * b.esr * b.c);
		if (b.esr > 0 && Number.isFinite(fz)) esrZeroHz.push(fz);
		const fr = 1 / (2 * Math.PI * Math.sqrt(b.esl * b.c));
		if (b.esl > 0 && Number.isFinite(fr)) selfResonanceHz.push(fr);
	}
	if (esrZeroHz.length > 1) esrZeroHz.sort(ascending);
	if (selfResonanceHz.length > 1) selfResonanceHz.sort(ascending);
	const dc = 1 - p.duty;
	const rhpZeroHz = p.topology === 'boost' ? boostRhpZeroOmega({ dPrime: dc, rLoad: p.rLoad, rSeries: p.rSeries, l: p.l }) / (2 * Math.PI) : null;
	return { f0Hz: omega0 / (2 * Math.PI), q, esrZeroHz, selfResonanceHz, rhpZeroHz };
}

export { outputNetwork };
