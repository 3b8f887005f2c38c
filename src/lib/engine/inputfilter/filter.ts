/**
 * Input LC filter with parallel R–C damping (Rd in series with Cd across Cf), its output
 * impedance Zs (source shorted, seen from the converter), Erickson's optimum damping, and the
 * loop gain with the filter in place, T' = T·(1 + Zs/ZN)/(1 + Zs/ZD) (docs/formulas.md §9)
 * [published: Middlebrook, IEEE IAS 1976; Erickson, "Optimal Single Resistor Damping of Input
 * Filters", IEEE APEC 1999; E&M 2nd ed. §10.4]. Zs = (rf + sLf) ∥ 1/(sCf) ∥ (Rd + 1/(sCd)).
 */
import { polyAdd, polyMul, polyProduct, polyScale, polyShift, type Poly } from '../math/polynomial';
import { polyRoots } from '../math/roots';
import { cancelCommon, multiply } from '../tf/algebra';
import { fromPolynomials, rootsToFactors } from '../tf/convert';
import { evaluate } from '../tf/evaluate';
import type { FactoredTf, Root } from '../tf/types';

export interface InputFilter {
	/** Filter inductance Lf, H. */
	l: number;
	/** Series resistance of Lf, Ω [0]. */
	dcr?: number;
	/** Filter capacitance Cf, F. */
	c: number;
	/** Damping branch across Cf: Rd in series with Cd; null = undamped. */
	damping?: { rd: number; cd: number } | null;
}

/** Characteristic impedance R0f = sqrt(Lf/Cf) and resonance f0 = 1/(2π·sqrt(Lf·Cf)). */
export function filterFeatures(f: InputFilter): { r0: number; f0Hz: number } {
	return { r0: Math.sqrt(f.l / f.c), f0Hz: 1 / (2 * Math.PI * Math.sqrt(f.l * f.c)) };
}

/** Zs as ascending polynomials (num, den) in s. */
export function filterImpedancePolys(f: InputFilter): { num: number[]; den: number[] } {
	const zl = [f.dcr ?? 0, f.l];
	const d = f.damping;
	if (!d) return { num: zl, den: polyAdd([1], polyShift(polyScale(zl, f.c), 1)) };
	const damp = [1, d.rd * d.cd];
	const num = polyMul(zl, damp);
	const den = polyAdd(polyMul(damp, polyAdd([1], polyShift(polyScale(zl, f.c), 1))), polyShift(polyScale(zl, d.cd), 1));
	return { num, den };
}

/** Zs in factored form. */
export function filterOutputImpedance(f: InputFilter): FactoredTf {
	const p = filterImpedancePolys(f);
	return fromPolynomials(p.num, p.den);
}

/**
 * Optimum damping for Cd = n·Cf with lossless Lf (docs/formulas.md §9, Erickson 1999):
 * Qopt = Rd/R0f = sqrt((2 + n)(4 + 3n)/(2n²(4 + n))), peak |Zs| = R0f·sqrt(2(2 + n))/n.
 */
export function optimalDamping(lf: number, cf: number, n: number): { rd: number; cd: number; qOpt: number; peakZs: number } {
	if (!(n > 0)) throw new RangeError('inputFilter: the damping ratio n = Cd/Cf must be > 0');
	const r0 = Math.sqrt(lf / cf);
	const qOpt = Math.sqrt(((2 + n) * (4 + 3 * n)) / (2 * n * n * (4 + n)));
	return { rd: qOpt * r0, cd: n * cf, qOpt, peakZs: (r0 * Math.sqrt(2 * (2 + n))) / n };
}

/** Peak of |Zs(j2πf)| on a log grid, refined by golden-section search in log f. */
export function peakImpedance(zs: FactoredTf, startHz: number, stopHz: number, pointsPerDecade = 400): { peak: number; freqHz: number } {
	const mag = (f: number) => {
		const z = evaluate(zs, 2 * Math.PI * f);
		return Math.hypot(z.re, z.im);
	};
	const n = Math.ceil(Math.log10(stopHz / startHz) * pointsPerDecade) + 1;
	let best = -1;
	let bi = 0;
	const fs: number[] = [];
	for (let i = 0; i < n; i++) {
		const f = startHz * Math.pow(stopHz / startHz, i / (n - 1));
		fs.push(f);
		const m = mag(f);
		if (m > best) {
			best = m;
			bi = i;
		}
	}
	let a = Math.log(fs[Math.max(0, bi - 1)]);
	let b = Math.log(fs[Math.min(n - 1, bi + 1)]);
	const g = (Math.sqrt(5) - 1) / 2;
	for (let k = 0; k < 100 && b - a > 1e-12; k++) {
		const x1 = b - g * (b - a);
		const x2 = a + g * (b - a);
		if (mag(Math.exp(x1)) > mag(Math.exp(x2))) b = x2;
		else a = x1;
	}
	const fx = Math.exp(0.5 * (a + b));
	const m = mag(fx);
	return m >= best ? { peak: m, freqHz: fx } : { peak: best, freqHz: fs[bi] };
}

const rootMag = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0);

function factorPolyScaled(r: Root, k: number): number[] {
	if (r.kind === 'real') return [1, k / r.omega];
	const invQ = Number.isFinite(r.q) ? 1 / r.q : 0;
	const x = k / r.omega0;
	return [1, invQ * x, x * x];
}

/** num/den of a factored tf in x = s/k (ascending). */
function scaledPolys(t: FactoredTf, k: number): { num: number[]; den: number[] } {
	let num = polyScale(polyProduct(t.zeros.map((r) => factorPolyScaled(r, k))), t.gain * Math.pow(k, t.originPower));
	let den = polyProduct(t.poles.map((r) => factorPolyScaled(r, k)));
	if (t.originPower > 0) num = polyShift(num, t.originPower);
	if (t.originPower < 0) den = polyShift(den, -t.originPower);
	return { num, den };
}

function factorsOf(p: Poly, k: number): Root[] {
	let low = 0;
	while (p[low] === 0) low++;
	if (low > 0) throw new RangeError('inputFilter: the correction factor has a root at s = 0');
	const r = polyRoots(p);
	return rootsToFactors(r.roots.map((z) => ({ re: z.re * k, im: z.im * k }))).factors;
}

/**
 * The correction factor F = (1 + Zs/ZN)/(1 + Zs/ZD) in factored form. ZN's numerator factors
 * (the boost's RHP zero) and ZD's numerator factors (the plant's Δ) are kept as the very
 * same factor objects, so T·F cancels them exactly against Gvd (no spurious RHP pole pair).
 */
export function filterCorrection(zs: FactoredTf, zn: FactoredTf, zd: FactoredTf): FactoredTf {
	const all = [...zs.zeros, ...zs.poles, ...zn.zeros, ...zn.poles, ...zd.zeros, ...zd.poles].map(rootMag).filter((w) => w > 0);
	const k = all.length ? Math.exp(all.reduce((a, w) => a + Math.log(w), 0) / all.length) : 1;
	const s = scaledPolys(zs, k);
	const n = scaledPolys(zn, k);
	const d = scaledPolys(zd, k);
	// 1 + Zs/ZN = (nN·dZs + nZs·dN)/(nN·dZs); 1 + Zs/ZD = (nD·dZs + nZs·dD)/(nD·dZs).
	const top = polyAdd(polyMul(n.num, s.den), polyMul(s.num, n.den));
	const bottom = polyAdd(polyMul(d.num, s.den), polyMul(s.num, d.den));
	if (zn.originPower !== 0 || zd.originPower !== 0) throw new RangeError('inputFilter: ZN and ZD must be finite and non-zero at DC');
	// Values at s = 0 straight from the factored forms (every factor is 1 there).
	const zs0 = zs.originPower > 0 ? 0 : zs.gain;
	if (zs.originPower < 0) throw new RangeError('inputFilter: Zs must be finite at DC');
	const dc = (1 + zs0 / zn.gain) / (1 + zs0 / zd.gain);
	return {
		gain: dc,
		originPower: 0,
		// F = top·nD / (nN·bottom)
		zeros: [...factorsOf(top, k), ...zd.zeros],
		poles: [...zn.zeros, ...factorsOf(bottom, k)]
	};
}

/** Loop gain with the filter: T' = T·F, with the exact cancellations of filterCorrection. */
export function loopWithFilter(loop: FactoredTf, correction: FactoredTf): FactoredTf {
	return cancelCommon(multiply(loop, correction), 1e-12);
}
