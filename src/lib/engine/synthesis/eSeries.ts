// IEC 60063 preferred-number series (E3…E192) and rounding to the nearest member in log ratio.
// Tables are integer mantissas (2 digits up to E24, 3 digits from E48) so no float artefacts enter the data;
// they match reference/e-series/*.txt (checked by a test). Source: IEC 60063:2015; rounding rule:
// minimise |ln(x/v)| [common practice]. Pure functions, no I/O.

export const E_SERIES_NAMES = ['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192'] as const;
export type ESeriesName = (typeof E_SERIES_NAMES)[number];

/** Decade mantissas ×10 (E3–E24) or ×100 (E48–E192), ascending, as in IEC 60063. */
export const E_SERIES: Readonly<Record<ESeriesName, readonly number[]>> = {
	E3: [
		10, 22, 47,
	],
	E6: [
		10, 15, 22, 33, 47, 68,
	],
	E12: [
		10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82,
	],
	E24: [
		10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30,
		33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91,
	],
	E48: [
		100, 105, 110, 115, 121, 127, 133, 140, 147, 154, 162, 169,
		178, 187, 196, 205, 215, 226, 237, 249, 261, 274, 287, 301,
		316, 332, 348, 365, 383, 402, 422, 442, 464, 487, 511, 536,
		562, 590, 619, 649, 681, 715, 750, 787, 825, 866, 909, 953,
	],
	E96: [
		100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130,
		133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169, 174,
		178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232,
		237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309,
		316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412,
		422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549,
		562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732,
		750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976,
	],
	E192: [
		100, 101, 102, 104, 105, 106, 107, 109, 110, 111, 113, 114,
		115, 117, 118, 120, 121, 123, 124, 126, 127, 129, 130, 132,
		133, 135, 137, 138, 140, 142, 143, 145, 147, 149, 150, 152,
		154, 156, 158, 160, 162, 164, 165, 167, 169, 172, 174, 176,
		178, 180, 182, 184, 187, 189, 191, 193, 196, 198, 200, 203,
		205, 208, 210, 213, 215, 218, 221, 223, 226, 229, 232, 234,
		237, 240, 243, 246, 249, 252, 255, 258, 261, 264, 267, 271,
		274, 277, 280, 284, 287, 291, 294, 298, 301, 305, 309, 312,
		316, 320, 324, 328, 332, 336, 340, 344, 348, 352, 357, 361,
		365, 370, 374, 379, 383, 388, 392, 397, 402, 407, 412, 417,
		422, 427, 432, 437, 442, 448, 453, 459, 464, 470, 475, 481,
		487, 493, 499, 505, 511, 517, 523, 530, 536, 542, 549, 556,
		562, 569, 576, 583, 590, 597, 604, 612, 619, 626, 634, 642,
		649, 657, 665, 673, 681, 690, 698, 706, 715, 723, 732, 741,
		750, 759, 768, 777, 787, 796, 806, 816, 825, 835, 845, 856,
		866, 876, 887, 898, 909, 920, 931, 942, 953, 965, 976, 988,
	],
};

/** Significant digits of a series' mantissas: 2 up to E24, 3 from E48. */
export function seriesDigits(series: ESeriesName): 2 | 3 {
	return E_SERIES[series].length <= 24 ? 2 : 3;
}

export function isESeriesName(name: string): name is ESeriesName {
	return (E_SERIES_NAMES as readonly string[]).includes(name);
}

/** mantissa × 10^exponent built with one correctly rounded operation, so 47e-10 comes out as the double of "4.7e-9". */
function scaled(mantissa: number, exponent: number): number {
	return exponent >= 0 ? mantissa * 10 ** exponent : mantissa / 10 ** -exponent;
}

/** The i-th candidate counting from the lowest decade's first mantissa (exponent `first`). */
function candidateAt(table: readonly number[], first: number, i: number): number {
	const len = table.length;
	const k = Math.floor(i / len);
	return scaled(table[i - k * len], first + k);
}

export interface SeriesRounding {
	/** The chosen series member. */
	value: number;
	/** value / input − 1 (signed relative change). */
	relativeChange: number;
}

/**
 * Nearest member of `series` to `value`, judged by |ln(value/member)| (nearest in log ratio).
 * Members of the decade below and above are candidates too (0.95 → E24 0.91, 9190 → E12 10 000).
 * An exact tie (a geometric midpoint, which floats almost never hit) goes to the smaller member.
 */
export function nearestInSeries(value: number, series: ESeriesName): SeriesRounding {
	if (!Number.isFinite(value) || value <= 0) {
		throw new RangeError(`E-series rounding needs a finite value > 0, got ${value}`);
	}
	const table = E_SERIES[series];
	const shift = 1 - seriesDigits(series);
	const decade = Math.floor(Math.log10(value));
	// The candidates, decade − 1 to decade + 1 in order, ascend strictly, and |ln(value/c)| falls
	// then rises along them: binary-search the first candidate ≥ value and compare it with the
	// one before (ties go to the smaller). Three decades keep the choice robust to log10 landing
	// one ulp off a decade boundary.
	const first = decade - 1 + shift;
	let lo = 0;
	let hi = 3 * table.length - 1;
	if (candidateAt(table, first, hi) < value) lo = hi;
	else {
		while (lo < hi) {
			const mid = (lo + hi) >> 1;
			if (candidateAt(table, first, mid) < value) lo = mid + 1;
			else hi = mid;
		}
	}
	let best = candidateAt(table, first, lo);
	if (lo > 0) {
		const below = candidateAt(table, first, lo - 1);
		if (Math.abs(Math.log(value / below)) <= Math.abs(Math.log(value / best))) best = below;
	}
	return { value: best, relativeChange: best / value - 1 };
}

/** Shorthand for nearestInSeries(value, series).value. */
export function roundToSeries(value: number, series: ESeriesName): number {
	return nearestInSeries(value, series).value;
}

/** Mantissa sets per series, for membership tests without a search. */
const MEMBERS = Object.fromEntries(E_SERIES_NAMES.map((name) => [name, new Set(E_SERIES[name])])) as Record<ESeriesName, Set<number>>;

/**
 * True when `value` is (to 1e-9 relative) a member of `series` in some decade; the same answer
 * as |nearestInSeries(value).relativeChange| < 1e-9 (any member that close is the nearest, the
 * next being ≥ 1 % away). A member that close has the exponent e0 = floor(log10 value) + 1 −
 * digits, or one off it when log10 lands an ulp across a decade; the rounded mantissa shows which.
 */
export function isInSeries(value: number, series: ESeriesName): boolean {
	if (!Number.isFinite(value) || value <= 0) {
		throw new RangeError(`E-series rounding needs a finite value > 0, got ${value}`);
	}
	const members = MEMBERS[series];
	const digits = seriesDigits(series);
	const e0 = Math.floor(Math.log10(value)) + 1 - digits;
	const mantissa = Math.round(e0 >= 0 ? value / 10 ** e0 : value * 10 ** -e0);
	const e = mantissa >= 10 ** digits ? e0 + 1 : mantissa < 10 ** (digits - 1) ? e0 - 1 : e0;
	const m = e === e0 ? mantissa : Math.round(e >= 0 ? value / 10 ** e : value * 10 ** -e);
	return members.has(m) && Math.abs(scaled(m, e) / value - 1) < 1e-9;
}
