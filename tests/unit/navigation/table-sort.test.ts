// Sorting and filtering of the board table: missing values last both ways, natural order of
// rail names, stable ties, and every-word text matching.
import { describe, expect, it } from 'vitest';
import { matchesText, nextSort, sortRows } from '$lib/components/table/sort';

describe('sortRows', () => {
	const rows = [
		{ name: 'VDD_12V0', pm: 52 },
		{ name: 'VDD_1V8', pm: null },
		{ name: 'vdd_3v3', pm: 38.5 },
		{ name: 'VDD_5V0', pm: Number.NaN }
	];

	it('puts rows without a value last, ascending and descending', () => {
		expect(sortRows(rows, (r) => r.pm, 'asc').map((r) => r.name)).toEqual(['vdd_3v3', 'VDD_12V0', 'VDD_1V8', 'VDD_5V0']);
		expect(sortRows(rows, (r) => r.pm, 'desc').map((r) => r.name)).toEqual(['VDD_12V0', 'vdd_3v3', 'VDD_1V8', 'VDD_5V0']);
	});

	it('orders names by their digits as numbers and ignores case [common practice: natural sort]', () => {
		expect(sortRows(rows, (r) => r.name, 'asc').map((r) => r.name)).toEqual(['VDD_1V8', 'vdd_3v3', 'VDD_5V0', 'VDD_12V0']);
	});

	it('keeps the original order of equal values and does not touch the input', () => {
		const tied = [
			{ id: 'a', v: 1 },
			{ id: 'b', v: 0 },
			{ id: 'c', v: 1 }
		];
		expect(sortRows(tied, (r) => r.v, 'desc').map((r) => r.id)).toEqual(['a', 'c', 'b']);
		expect(tied.map((r) => r.id)).toEqual(['a', 'b', 'c']);
	});
});

describe('matchesText', () => {
	it('needs every word somewhere in the row, in any case', () => {
		expect(matchesText('1v8 buck', ['VDD_1V8', 'buck', null])).toBe(true);
		expect(matchesText('1v8 boost', ['VDD_1V8', 'buck'])).toBe(false);
		expect(matchesText('   ', ['anything'])).toBe(true);
	});
});

describe('nextSort', () => {
	it('flips the direction on the same column and starts a new column ascending', () => {
		expect(nextSort({ key: 'vout', dir: 'asc' }, 'vout')).toEqual({ key: 'vout', dir: 'desc' });
		expect(nextSort({ key: 'vout', dir: 'desc' }, 'fsw')).toEqual({ key: 'fsw', dir: 'asc' });
	});
});
