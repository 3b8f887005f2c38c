/**
 * The one corner set (DEVELOPERS.md, "Verdict rules"): the operating cases Vin {min, nom, max} × Iout {min, nom, max}
 * × temperature {min, 25 °C, max} (only when the document gives a temperature range) with duplicates removed and the nominal first, each later combined with the tolerance signs
 * (corners.ts). Every screen, export and count uses this list, and labels a corner with
 * `cornerLabel`. With feed-forward the ramp follows Vin; that scaling lives in one place,
 * plants/modulator.ts (modulatorTf(mod, vin, vinNominal)), which every corner build calls.
 */
import { PART_LABELS, type PartName } from './variation';
import { REFERENCE_TEMPERATURE_C } from '../plants/derating';

export type CaseName = 'min' | 'nom' | 'max';

export interface OperatingCase {
	vin: number;
	iout: number;
	vinCase: CaseName;
	ioutCase: CaseName;
	/** Part temperature, °C, and its case (absent without a temperature range). */
	temperatureC?: number;
	tempCase?: CaseName;
	nominal: boolean;
}

export interface OperatingRanges {
	/** The nominal operating point (plant.vin, plant.iout). */
	vin: number;
	iout: number;
	/** The ranges (document's corners.vin / corners.iout); absent = the nominal only. */
	vinRange?: { min: number; max: number };
	ioutRange?: { min: number; max: number };
	/** Temperature range, °C (the nominal is 25 °C); absent = 25 °C only, no T in the labels. */
	temperatureRange?: { min: number; max: number };
}

/** [name, value] for min, nom, max, a value equal to the nominal kept once (as 'nom'). */
function levels(nom: number, range?: { min: number; max: number }): [CaseName, number][] {
	const out: [CaseName, number][] = [['nom', nom]];
	if (!range) return out;
	if (range.min !== nom) out.unshift(['min', range.min]);
	if (range.max !== nom && range.max !== range.min) out.push(['max', range.max]);
	return out;
}

/** Vin × Iout operating cases, nominal first, the rest in reading order (Vin min…max, Iout min…max). */
export function operatingCases(r: OperatingRanges): OperatingCase[] {
	const out: OperatingCase[] = [];
	const temps: [CaseName | undefined, number | undefined][] = r.temperatureRange ? levels(REFERENCE_TEMPERATURE_C, r.temperatureRange) : [[undefined, undefined]];
	for (const [vinCase, vin] of levels(r.vin, r.vinRange)) {
		for (const [ioutCase, iout] of levels(r.iout, r.ioutRange)) {
			for (const [tempCase, temperatureC] of temps) {
				const nominal = vinCase === 'nom' && ioutCase === 'nom' && (tempCase ?? 'nom') === 'nom';
				out.push(tempCase ? { vin, iout, vinCase, ioutCase, temperatureC, tempCase, nominal } : { vin, iout, vinCase, ioutCase, nominal });
			}
		}
	}
	return out.sort((a, b) => Number(b.nominal) - Number(a.nominal));
}

/** "+20 %" / "−5 %" for a multiplier 1.2 / 0.95. */
function signedPercent(factor: number): string {
	const pct = Number(((factor - 1) * 100).toPrecision(3));
	return `${pct >= 0 ? '+' : '−'}${Math.abs(pct)} %`;
}

/** "Vin max, Iout min, L −20 %, C +10 %": the words every screen and export uses for a corner. */
export function cornerLabel(c: { vinCase: CaseName; ioutCase: CaseName; tempCase?: CaseName; factors?: Partial<Record<PartName, number>> }): string {
	const parts = [`Vin ${c.vinCase}`, `Iout ${c.ioutCase}`];
	if (c.tempCase) parts.push(`T ${c.tempCase}`);
	for (const [name, f] of Object.entries(c.factors ?? {})) {
		if (typeof f === 'number' && f !== 1) parts.push(`${PART_LABELS[name as PartName]} ${signedPercent(f)}`);
	}
	return parts.join(', ');
}
