// Rounds a compensator network to IEC 60063 series: resistors (R2, R3, Rb) and capacitors (C1, C2, C3) each to the
// nearest member in log ratio (§5.4). R1 is kept as entered (it is the user's choice and sets the divider current);
// gm and ro are properties of the amplifier, not parts to buy. Source: docs/formulas.md §5.4, §10 [common practice].
import { roundToSeries, type ESeriesName } from './eSeries';
import type { NetworkParts } from './networks';

export interface SeriesChoice {
	/** null = leave resistors as computed. */
	resistors: ESeriesName | null;
	/** null = leave capacitors as computed. */
	capacitors: ESeriesName | null;
}

/** Defaults when a design gives no `series`: E96 resistors, E12 capacitors (docs/formulas.md §5.4; common practice). */
export const DEFAULT_SERIES: SeriesChoice = { resistors: 'E96', capacitors: 'E12' };

const RESISTORS = ['r2', 'r3', 'rb'] as const;
const CAPACITORS = ['c1', 'c2', 'c3'] as const;

/** The part names a series applies to, by family. */
export function partFamily(name: string): 'resistor' | 'capacitor' | null {
	if (name === 'r1' || (RESISTORS as readonly string[]).includes(name)) return 'resistor';
	if ((CAPACITORS as readonly string[]).includes(name)) return 'capacitor';
	return null;
}

/** A copy of `parts` with every buyable part except R1 rounded to its family's series. */
export function roundParts<P extends NetworkParts>(parts: P, series: SeriesChoice): P {
	const out = { ...parts } as P & Record<string, unknown>;
	const record = out as Record<string, unknown>;
	for (const name of RESISTORS) {
		const value = record[name];
		if (series.resistors && typeof value === 'number') record[name] = roundToSeries(value, series.resistors);
	}
	for (const name of CAPACITORS) {
		const value = record[name];
		if (series.capacitors && typeof value === 'number') record[name] = roundToSeries(value, series.capacitors);
	}
	return out;
}
