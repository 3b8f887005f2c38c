// Sorting and filtering of table rows, pure so it is unit-tested. Missing values (null, NaN)
// sort last in both directions: a rail without a saved loop never pretends to be the best or
// the worst. Strings compare in natural order ("5V0" before "12V0"), case-insensitively.

export type SortDir = 'asc' | 'desc';
export type SortValue = number | string | null | undefined;

const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

const missing = (v: SortValue) => v === null || v === undefined || (typeof v === 'number' && Number.isNaN(v));

export function compareValues(a: SortValue, b: SortValue): number {
	if (typeof a === 'number' && typeof b === 'number') return a - b;
	return collator.compare(String(a), String(b));
}

/** A sorted copy; ties keep their original order (Array.prototype.sort is stable). */
export function sortRows<R>(rows: readonly R[], value: (row: R) => SortValue, dir: SortDir): R[] {
	const sign = dir === 'asc' ? 1 : -1;
	return [...rows].sort((ra, rb) => {
		const a = value(ra);
		const b = value(rb);
		const ma = missing(a);
		const mb = missing(b);
		if (ma || mb) return ma === mb ? 0 : ma ? 1 : -1;
		return sign * compareValues(a, b);
	});
}

/** True when every word of `query` occurs in one of `haystack`'s texts (case-insensitive). */
export function matchesText(query: string, haystack: readonly (string | null | undefined)[]): boolean {
	const words = query.toLowerCase().split(/\s+/).filter(Boolean);
	if (words.length === 0) return true;
	const text = haystack.filter(Boolean).join(' ').toLowerCase();
	return words.every((w) => text.includes(w));
}

/** The next sort state after a click on column `key`: a new column starts ascending. */
export function nextSort<K extends string>(current: { key: K; dir: SortDir }, key: K): { key: K; dir: SortDir } {
	return current.key === key ? { key, dir: current.dir === 'asc' ? 'desc' : 'asc' } : { key, dir: 'asc' };
}
