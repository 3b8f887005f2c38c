/**
 * Capacitor derating: the capacitance a ceramic part really has at the
 * operating point, from the typed (nominal, 0 V, 25 °C) value:
 *   C_eff = C · dcBias(V) · temperature(T) · (1 − ageing)
 * - DC bias: measured points (V, C) interpolated linearly from (0 V, C) through them and held
 *   at the last point beyond it, or the curve C(V) = C0 / (1 + (V/V0)^k) with the part's V0, k.
 * - Temperature: a class code of EIA-198 form [common practice: the class letters as printed on
 *   every ceramic capacitor data sheet; the standard itself not consulted here]. Class II codes
 *   read low-temperature letter (X −55, Y −30, Z +10 °C), high-temperature digit (4 +65, 5 +85,
 *   6 +105, 7 +125, 8 +150, 9 +200 °C) and change letter (P ±10 %, R ±15 %, S ±22 %, T +22/−33 %,
 *   U +22/−56 %, V +22/−82 %) — the largest change anywhere in the range. Class I C0G (NP0):
 *   0 ± 30 ppm/°C. At a temperature corner a class II part takes the band's lower limit (class II
 *   curves fall towards both ends of their range [common practice]); C0G moves by −30 ppm/°C·|T − 25 °C|.
 * - Ageing: a fraction of the value lost over the product's life, entered by the user (class II
 *   dielectrics lose about 1–3 % per decade of hours [common practice]).
 * Pure functions; the document mapping (pipeline/documentModel.ts) is the only caller that builds stages.
 */

export type DcBias = { points: { v: number; c: number }[] } | { v0: number; k: number };

export interface CapacitorDerating {
	dcBias?: DcBias;
	/** EIA-198 style class code, e.g. "X7R", "X5R", "C0G". */
	tempClass?: string;
	/** Fraction of the value lost to ageing (0.05 = 5 %). */
	ageing?: number;
}

/** Reference temperature of the typed value, °C [common practice: data-sheet values at 25 °C]. */
export const REFERENCE_TEMPERATURE_C = 25;

const LOW_TEMP: Record<string, number> = { X: -55, Y: -30, Z: 10 };
const HIGH_TEMP: Record<string, number> = { '4': 65, '5': 85, '6': 105, '7': 125, '8': 150, '9': 200 };
/** Change letter → [largest rise, largest fall] as fractions. */
const CHANGE: Record<string, [number, number]> = {
	P: [0.1, 0.1],
	R: [0.15, 0.15],
	S: [0.22, 0.22],
	T: [0.22, 0.33],
	U: [0.22, 0.56],
	V: [0.22, 0.82]
};
const C0G_PPM_PER_C = 30;

export interface TemperatureClass {
	code: string;
	/** Rated range, °C. */
	minC: number;
	maxC: number;
	/** Relative change at T (°C) used at a temperature corner (negative = loss). */
	factorAt(temperatureC: number): number;
}

/** The class of a code ("X7R", "x5r", "C0G", "NP0"), or null when the code is not one of these forms. */
export function temperatureClass(code: string): TemperatureClass | null {
	const c = code.trim().toUpperCase();
	if (c === 'C0G' || c === 'COG' || c === 'NP0' || c === 'NPO') {
		return {
			code: 'C0G',
			minC: -55,
			maxC: 125,
			factorAt: (t) => 1 - (C0G_PPM_PER_C * 1e-6 * Math.abs(t - REFERENCE_TEMPERATURE_C))
		};
	}
	const m = /^([XYZ])([4-9])([PRSTUV])$/.exec(c);
	if (!m) return null;
	const [, lo, hi, ch] = m;
	const fall = CHANGE[ch][1];
	return {
		code: c,
		minC: LOW_TEMP[lo],
		maxC: HIGH_TEMP[hi],
		// The band is a bound over the whole range, not a curve: the full fall away from 25 °C.
		factorAt: (t) => (t === REFERENCE_TEMPERATURE_C ? 1 : 1 - fall)
	};
}

/** The DC-bias factor C(V)/C at the working voltage. */
export function dcBiasFactor(c: number, bias: DcBias, volts: number): number {
	const v = Math.abs(volts);
	if ('points' in bias) {
		const pts = [{ v: 0, c }, ...[...bias.points].sort((a, b) => a.v - b.v)];
		let value = pts[pts.length - 1].c;
		for (let i = 1; i < pts.length; i++) {
			if (v <= pts[i].v) {
				const a = pts[i - 1];
				const b = pts[i];
				value = b.v === a.v ? b.c : a.c + ((b.c - a.c) * (v - a.v)) / (b.v - a.v);
				break;
			}
		}
		return value / c;
	}
	return 1 / (1 + Math.pow(v / bias.v0, bias.k));
}

export interface EffectiveCapacitance {
	/** Typed value per part, F. */
	typed: number;
	/** Value every analysis uses, F. */
	effective: number;
	dcBias: number;
	temperature: number;
	ageing: number;
}

/** The effective value per part at `volts` across it and `temperatureC`. */
export function effectiveCapacitance(c: number, d: CapacitorDerating | undefined, volts: number, temperatureC = REFERENCE_TEMPERATURE_C): EffectiveCapacitance {
	const dcBias = d?.dcBias ? dcBiasFactor(c, d.dcBias, volts) : 1;
	const cls = d?.tempClass ? temperatureClass(d.tempClass) : null;
	const temperature = cls ? cls.factorAt(temperatureC) : 1;
	const ageing = 1 - (d?.ageing ?? 0);
	return { typed: c, effective: c * dcBias * temperature * ageing, dcBias, temperature, ageing };
}

/** What moves a stage from 25 °C to another temperature (see applyVariation). */
export interface ThermalModel {
	/** Class code per capacitor branch (null = no temperature data: the value stays). */
	tempClasses: (string | null)[];
	/** Relative RDS(on) rise per °C (0 = none given). */
	rdsOnTempco: number;
}

/** Copper's resistance temperature coefficient, 1/°C [published: CRC Handbook of Chemistry and Physics, copper α ≈ 0.00393 K⁻¹ near 20 °C]. */
export const COPPER_TEMPCO_PER_C = 0.00393;

/** Winding resistance at temperatureC from its 25 °C value. */
export function dcrAt(dcr25: number, temperatureC: number): number {
	return dcr25 * (1 + COPPER_TEMPCO_PER_C * (temperatureC - REFERENCE_TEMPERATURE_C));
}

/** Switch on-resistance at temperatureC from its 25 °C value and a linear coefficient (1/°C, optional). */
export function rdsOnAt(rds25: number, tempcoPerC: number | undefined, temperatureC: number): number {
	return rds25 * (1 + (tempcoPerC ?? 0) * (temperatureC - REFERENCE_TEMPERATURE_C));
}
