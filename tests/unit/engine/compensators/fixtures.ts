// Test plants built straight from the exact averaged models of docs/formulas.md (§1.3 buck, §2.3 boost), so the
// compensator tests do not depend on the plants module. Returned as Fm·Gvd (factored) with its features.
import { fromPolynomials, multiply, constantTf, type FactoredTf } from '../../../../src/lib/engine/tf';

export interface TestPlant {
	plant: FactoredTf;
	fswHz: number;
	features: { f0Hz: number; q: number; esrZeroHz: number[]; rhpZeroHz: number | null };
	vout: number;
	vref: number;
}

/** VM buck, CCM (§1.3): Gvd = Vg·R·(1 + sRcC)/(a2 s² + a1 s + a0); Fm = 1/vramp. */
export function buckPlant(o: { vin: number; vout: number; iout: number; l: number; r: number; c: number; rc: number; vramp: number; fswHz: number; vref: number }): TestPlant {
	const R = o.vout / o.iout;
	const { l: L, r, c: C, rc: Rc } = o;
	const a2 = L * C * (R + Rc);
	const a1 = L + C * (R * r + R * Rc + r * Rc);
	const a0 = R + r;
	const gvd = fromPolynomials([o.vin * R, o.vin * R * Rc * C], [a0, a1, a2]);
	const w0 = Math.sqrt(a0 / a2);
	return {
		plant: multiply(constantTf(1 / o.vramp), gvd),
		fswHz: o.fswHz,
		features: { f0Hz: w0 / (2 * Math.PI), q: Math.sqrt(a0 * a2) / a1, esrZeroHz: [1 / (2 * Math.PI * Rc * C)], rhpZeroHz: null },
		vout: o.vout,
		vref: o.vref
	};
}

/** VM boost, CCM (§2.3): Gvd = (V/D')(1 + sRcC)(D'²R − r − sL)/Δb with D' from §2.1 (lossless when r = 0). */
export function boostPlant(o: { vin: number; vout: number; iout: number; l: number; r: number; c: number; rc: number; vramp: number; fswHz: number; vref: number }): TestPlant {
	const R = o.vout / o.iout;
	const { l: L, r, c: C, rc: Rc } = o;
	const V = o.vout;
	const dp = (o.vin * R + Math.sqrt(o.vin * o.vin * R * R - 4 * V * V * R * r)) / (2 * V * R);
	const b2 = L * C * (R + Rc);
	const b1 = L + C * (R * r + Rc * r + dp * dp * R * Rc);
	const b0 = dp * dp * R + r;
	const k = V / dp;
	// (1 + sRcC)(D'²R − r − sL) expanded, ascending
	const n0 = dp * dp * R - r;
	const num = [k * n0, k * (n0 * Rc * C - L), -k * L * Rc * C];
	const gvd = fromPolynomials(num, [b0, b1, b2]);
	return {
		plant: multiply(constantTf(1 / o.vramp), gvd),
		fswHz: o.fswHz,
		features: {
			f0Hz: Math.sqrt(b0 / b2) / (2 * Math.PI),
			q: Math.sqrt(b0 * b2) / b1,
			esrZeroHz: [1 / (2 * Math.PI * Rc * C)],
			rhpZeroHz: n0 / L / (2 * Math.PI)
		},
		vout: o.vout,
		vref: o.vref
	};
}

/** The design document's example buck: 5 V → 1.2 V, 8 A, 600 kHz, 1 µH/4 mΩ + 6 mΩ, 3 × 47 µF/2 mΩ, 1 V ramp. */
export const exampleBuck = () =>
	buckPlant({ vin: 5, vout: 1.2, iout: 8, l: 1e-6, r: 0.01, c: 141e-6, rc: 0.002 / 3, vramp: 1, fswHz: 600e3, vref: 0.6 });

/** A 9 V → 12 V, 2 A boost at 500 kHz: 2.2 µH/15 mΩ, 2 × 22 µF/5 mΩ, 1.5 V ramp, 1.25 V reference. */
export const exampleBoost = () =>
	boostPlant({ vin: 9, vout: 12, iout: 2, l: 2.2e-6, r: 0.015, c: 44e-6, rc: 0.0025, vramp: 1.5, fswHz: 500e3, vref: 1.25 });

/** A buck on a bulk capacitor with real ESR (470 µF, 30 mΩ: ESR zero 11.3 kHz, below fc) — the Type II case of §6.4. */
export const esrBuck = () =>
	buckPlant({ vin: 12, vout: 3.3, iout: 3, l: 4.7e-6, r: 0.02, c: 470e-6, rc: 0.03, vramp: 1.8, fswHz: 500e3, vref: 0.8 });
