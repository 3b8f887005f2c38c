/**
 * The design screen's corners: Vin {min, nom, max} × Iout {min, nom, max}, nine cases with the
 * nominal first. The compensator is designed at the nominal case and then held fixed (its
 * built parts) while the power stage moves to each corner.
 */
import type { OperatingRange } from './form';

export interface DesignCorner {
	id: string;
	vin: number;
	iout: number;
	nominal: boolean;
	/** "Vin max, Iout min" — the words used in the verdict. */
	label: string;
}

const NAMES = ['min', 'nom', 'max'] as const;

export function designCorners(range: OperatingRange): DesignCorner[] {
	const out: DesignCorner[] = [];
	const seen = new Set<string>();
	for (let i = 0; i < 3; i++) {
		for (let j = 0; j < 3; j++) {
			const vin = range.vin[i];
			const iout = range.iout[j];
			// A range with min = nom (or nom = max) would repeat a case; keep the first.
			const key = `${vin}|${iout}`;
			if (seen.has(key) && !(i === 1 && j === 1)) continue;
			seen.add(key);
			out.push({ id: `vin-${NAMES[i]}_iout-${NAMES[j]}`, vin, iout, nominal: i === 1 && j === 1, label: `Vin ${NAMES[i]}, Iout ${NAMES[j]}` });
		}
	}
	// Nominal first; the rest in reading order.
	return out.sort((a, b) => Number(b.nominal) - Number(a.nominal));
}
