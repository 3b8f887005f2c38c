/**
 * Unit symbols a field may carry, with the spellings people type for them.
 * A trailing unit is optional in every field; a different known unit is reported, not ignored.
 */

export type UnitSymbol = 'V' | 'A' | 'Ω' | 'H' | 'F' | 'Hz' | 's' | 'S' | 'W' | 'C' | 'V/s' | 'V/A' | '';

/** Accepted spellings of each unit, matched case-insensitively at the end of the text. */
export const UNIT_ALIASES: Readonly<Record<Exclude<UnitSymbol, ''>, readonly string[]>> = {
	V: ['V'],
	A: ['A'],
	'Ω': ['Ω', 'Ω', 'ohms', 'ohm'], // U+03A9 and the ohm sign U+2126
	H: ['H'],
	F: ['F'],
	Hz: ['Hz'],
	s: ['s', 'sec'],
	S: ['S'],
	W: ['W'],
	// Charge (gate charge, reverse-recovery charge): coulomb.
	C: ['C'],
	// Slopes and the current-sense gain of peak current mode (a sense gain is not typed in Ω: it
	// includes the amplifier's gain).
	'V/s': ['V/s', 'V/sec'],
	'V/A': ['V/A']
};

/** Longest alias first, so that `ohms` wins over `s`. */
export const ALL_ALIASES: readonly { unit: Exclude<UnitSymbol, ''>; alias: string }[] = Object.entries(UNIT_ALIASES)
	.flatMap(([unit, aliases]) => aliases.map((alias) => ({ unit: unit as Exclude<UnitSymbol, ''>, alias })))
	.sort((a, b) => b.alias.length - a.alias.length);
