// Compensator transfer functions from parts, in the factored form of tf/. Gc is from the output voltage to the
// amplifier output without the inverting sign (docs/formulas.md §0). Ideal op-amp: Gc = Zf/Zi (§5.1–§5.3); OTA: Gc = H·gm·Zc (§5.5,
// optionally ∥ Ro); finite single-pole op-amp: Gc = Gc_ideal/(1 + NG/A), NG = 1 + Zf/(Zi ∥ Rb) (§5.6), expanded to
// ascending polynomials and factored again with the engine's root finder.
import { polyAdd, polyEvalComplex, polyMul, polyScale, type Poly } from '../math/polynomial';
import { fromPolynomials } from '../tf/convert';
import { realRootHz, type FactoredTf } from '../tf/types';
import { dividerRatio, shapeCorners, shapeFromParts, type NetworkParts } from '../synthesis/networks';

const TWO_PI = 2 * Math.PI;

/** Single-pole op-amp: A(s) = A0/(1 + s/ωa), A0 = 10^(a0Db/20), ωa = 2π·gbw/A0. */
export interface OpampModel {
	a0Db: number;
	/** Gain-bandwidth product, Hz. */
	gbw: number;
}

/** Ideal-amplifier Gc of a network, built straight from its corners (no polynomial step). */
export function idealCompensatorTf(parts: NetworkParts): FactoredTf {
	if (parts.kind === 'type2-ota' && parts.ro != null) return otaWithOutputResistance(parts, parts.ro);
	const shape = shapeFromParts(parts);
	const { zerosHz, polesHz } = shapeCorners(shape);
	return {
		gain: TWO_PI * shape.integratorHz,
		originPower: -1,
		zeros: zerosHz.map((f) => realRootHz(f)),
		poles: polesHz.map((f) => realRootHz(f))
	};
}

/** H·gm·(Zc ∥ Ro): DC gain H·gm·Ro, the R2–C1 zero, and two real poles from 1 + s(R2C1 + Ro·Csum) + s²·Ro·R2·C1·C2. */
function otaWithOutputResistance(p: Extract<NetworkParts, { kind: 'type2-ota' }>, ro: number): FactoredTf {
	const csum = p.c1 + p.c2;
	const num = polyScale([1, p.r2 * p.c1], dividerRatio(p) * p.gm * ro);
	const den = [1, p.r2 * p.c1 + ro * csum, ro * p.r2 * p.c1 * p.c2];
	return fromPolynomials(num, den);
}

/** Impedances as ascending polynomial ratios: Zf = nf/df, Yi = 1/Zi = yn/yd. */
function opampImpedances(parts: Exclude<NetworkParts, { kind: 'type2-ota' }>): { nf: Poly; df: Poly; yn: Poly; yd: Poly } {
	const { r1 } = parts;
	if (parts.kind === 'type1') return { nf: [1], df: [0, parts.c1], yn: [1], yd: [r1] };
	const { r2, c1, c2 } = parts;
	const nf = [1, r2 * c1];
	const df = [0, c1 + c2, r2 * c1 * c2];
	if (parts.kind === 'type2') return { nf, df, yn: [1], yd: [r1] };
	const { r3, c3 } = parts;
	// 1/(R1 ∥ (R3 + 1/sC3)) = (1 + s(R1 + R3)C3) / (R1·(1 + sR3C3))
	return { nf, df, yn: [1, (r1 + r3) * c3], yd: [r1, r1 * r3 * c3] };
}

/**
 * Gc with a finite single-pole op-amp (§5.6):
 *   Gc = nf·yn·A0 / [ A0·df·yd + (1 + s/ωa)·(df·yd + nf·yn + nf·yd/Rb) ]
 * which is Gc_ideal / (1 + NG/A) with NG = 1 + Zf·Yi + Zf/Rb multiplied through by df·yd·(1 + s/ωa).
 */
export function finiteOpampCompensatorTf(parts: NetworkParts, opamp: OpampModel): FactoredTf {
	if (parts.kind === 'type2-ota') {
		throw new RangeError('compensator.opamp models a voltage-feedback op-amp; a type2-ota uses parts.gm (and parts.ro)');
	}
	const a0 = 10 ** (opamp.a0Db / 20);
	const omegaA = (TWO_PI * opamp.gbw) / a0;
	const { nf, df, yn, yd } = opampImpedances(parts);
	const dfyd = polyMul(df, yd);
	const loading = polyAdd(polyAdd(dfyd, polyMul(nf, yn)), parts.rb === null ? [] : polyScale(polyMul(nf, yd), 1 / parts.rb));
	const den = polyAdd(polyScale(dfyd, a0), polyMul([1, 1 / omegaA], loading));
	const num = polyScale(polyMul(nf, yn), a0);
	return fromPolynomials(num, den);
}

/** Gc for the parts: ideal, or with the finite op-amp when one is given. */
export function compensatorTf(parts: NetworkParts, opamp?: OpampModel | null): FactoredTf {
	return opamp ? finiteOpampCompensatorTf(parts, opamp) : idealCompensatorTf(parts);
}

/** |NG(j2πf)| = |1 + Zf/(Zi ∥ Rb)| of an op-amp network (what the op-amp's loop gain must exceed). */
export function noiseGainMagnitude(parts: Exclude<NetworkParts, { kind: 'type2-ota' }>, freqHz: number): number {
	const { nf, df, yn, yd } = opampImpedances(parts);
	const s = { re: 0, im: TWO_PI * freqHz };
	const zf = cdiv(peval(nf, s), peval(df, s));
	const yi = cdiv(peval(yn, s), peval(yd, s));
	const yb = parts.rb === null ? 0 : 1 / parts.rb;
	const t = cmul(zf, { re: yi.re + yb, im: yi.im });
	return Math.hypot(1 + t.re, t.im);
}

/** |A(j2πf)| of the single-pole op-amp. */
export function opampGainMagnitude(opamp: OpampModel, freqHz: number): number {
	const a0 = 10 ** (opamp.a0Db / 20);
	return a0 / Math.hypot(1, (freqHz * a0) / opamp.gbw);
}

type C = { re: number; im: number };
function peval(p: Poly, s: C): C {
	const [re, im] = polyEvalComplex(p, s.re, s.im);
	return { re, im };
}
const cmul = (a: C, b: C): C => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
function cdiv(a: C, b: C): C {
	const d = b.re * b.re + b.im * b.im;
	return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
