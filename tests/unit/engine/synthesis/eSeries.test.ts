// E-series tables and rounding. Tables vs the IEC 60063 lists committed in reference/e-series/;
// rounding vs the nearest-in-log-ratio rule [common practice] with check values from the formula sheet §10.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
	E_SERIES,
	E_SERIES_NAMES,
	isInSeries,
	nearestInSeries,
	roundToSeries,
	type ESeriesName
} from '../../../../src/lib/engine/synthesis/eSeries';

function committedList(name: ESeriesName): number[] {
	const file = resolve(process.cwd(), 'reference/e-series', `${name.toLowerCase()}.txt`);
	return readFileSync(file, 'utf8').split(/\s+/).filter(Boolean).map(Number);
}

describe('E-series tables', () => {
	it.each(E_SERIES_NAMES)('%s equals the committed IEC 60063 list', (name) => {
		// [published: IEC 60063:2015 lists, committed in reference/e-series/ with provenance]
		expect([...E_SERIES[name]]).toEqual(committedList(name));
	});

	it.each(E_SERIES_NAMES)('%s follows round(10^(i/n)) except the documented values', (name) => {
		// [published: IEC 60063 defines the series as rounded terms of 10^(i/n); exceptions per the standard]
		const n = E_SERIES[name].length;
		const scale = n <= 24 ? 10 : 100;
		const historical = new Map([[27, 26], [30, 29], [33, 32], [36, 35], [39, 38], [43, 42], [47, 46], [82, 83]]);
		const departures: string[] = [];
		E_SERIES[name].forEach((value, i) => {
			const geometric = Math.round(10 ** (i / n) * scale);
			if (value === geometric) return;
			if (n <= 24 && historical.get(value) === geometric) return;
			departures.push(`${i}:${value}/${geometric}`);
		});
		expect(departures).toEqual(name === 'E192' ? ['185:920/919'] : []);
	});

	it('nests E3⊂E6⊂E12⊂E24 and E48⊂E96⊂E192, but E24 is not inside E96', () => {
		// [published: IEC 60063 series nesting; E24 ∩ E96 = {1.0 1.1 1.3 1.5 2.0 7.5}]
		const subset = (a: ESeriesName, b: ESeriesName) => E_SERIES[a].every((v) => E_SERIES[b].includes(v));
		expect(subset('E3', 'E6') && subset('E6', 'E12') && subset('E12', 'E24')).toBe(true);
		expect(subset('E48', 'E96') && subset('E96', 'E192')).toBe(true);
		const inE96 = E_SERIES.E24.filter((v) => E_SERIES.E96.includes(v * 10));
		expect(inE96).toEqual([10, 11, 13, 15, 20, 75]);
	});
});

describe('roundToSeries (nearest in log ratio)', () => {
	// Check values: formula sheet §10 [common practice: nearest in log ratio].
	it.each([
		[1234, 'E96', 1240],
		[1234, 'E24', 1200],
		[1234, 'E12', 1200],
		[4990, 'E96', 4990],
		[4990, 'E24', 5100],
		[4990, 'E12', 4700],
		[15.8e-9, 'E96', 15.8e-9],
		[15.8e-9, 'E24', 16e-9],
		[15.8e-9, 'E12', 15e-9],
		[0.95, 'E96', 0.953],
		[0.95, 'E24', 0.91],
		[0.95, 'E12', 1.0],
		[9190, 'E96', 9090],
		[9190, 'E192', 9200],
		[9190, 'E24', 9100],
		[9190, 'E12', 10000]
	] as const)('%d in %s → %d', (value, series, expected) => {
		expect(roundToSeries(value, series)).toBe(expected);
	});

	it('uses the log midpoint, not the arithmetic one', () => {
		// [common practice] 1.1 sits nearer 1.2 than 1.0 in ratio (1.0909 vs 1.1); 9.1 is an arithmetic tie
		// between 8.2 and 10 but nearer 10 in ratio.
		expect(roundToSeries(1.1, 'E12')).toBe(1.2);
		expect(roundToSeries(9.1, 'E12')).toBe(10);
		const mid = Math.sqrt(1.0 * 1.2);
		expect(roundToSeries(mid * (1 - 1e-9), 'E12')).toBe(1);
		expect(roundToSeries(mid * (1 + 1e-9), 'E12')).toBe(1.2);
	});

	it('crosses decades at both ends and returns clean doubles', () => {
		// [common practice] values print as their nominal strings (no 4.7000000000000001e-9)
		expect(roundToSeries(999.9999, 'E96')).toBe(1000);
		expect(roundToSeries(1000, 'E96')).toBe(1000);
		expect(roundToSeries(1e-12, 'E12')).toBe(1e-12);
		expect(roundToSeries(4.69e-9, 'E12')).toBe(4.7e-9);
		expect(String(roundToSeries(2.2e-10, 'E6'))).toBe('2.2e-10');
		expect(roundToSeries(9.7e5, 'E3')).toBe(1e6);
		expect(roundToSeries(3.2e5, 'E3')).toBe(2.2e5); // ln(3.2/2.2)=0.375 < ln(4.7/3.2)=0.384
	});

	it('reports the relative change and membership', () => {
		const r = nearestInSeries(1234, 'E96');
		expect(r.relativeChange).toBeCloseTo(1240 / 1234 - 1, 15);
		expect(isInSeries(6.8e-9, 'E6')).toBe(true);
		expect(isInSeries(7.5e3, 'E12')).toBe(false);
	});

	it('rejects values that are not finite and positive', () => {
		for (const bad of [0, -1, Number.NaN, Number.POSITIVE_INFINITY]) {
			expect(() => roundToSeries(bad, 'E12')).toThrow(/finite value > 0/);
		}
	});

	it('property: the search equals the rule applied to every member of three decades', () => {
		// [common practice: minimise |ln(x/v)| over the members; exact ties to the smaller]
		const bruteForce = (value: number, series: ESeriesName) => {
			const table = E_SERIES[series];
			const digits = table.length <= 24 ? 2 : 3;
			const decade = Math.floor(Math.log10(value));
			let best = NaN;
			let bestD = Infinity;
			for (let k = decade - 1; k <= decade + 1; k++) {
				for (const m of table) {
					const e = k - (digits - 1);
					const c = e >= 0 ? m * 10 ** e : m / 10 ** -e;
					const d = Math.abs(Math.log(value / c));
					if (d < bestD) {
						best = c;
						bestD = d;
					}
				}
			}
			return best;
		};
		fc.assert(
			fc.property(fc.double({ min: -13, max: 10, noNaN: true }), fc.constantFrom(...E_SERIES_NAMES), (logV, series) => {
				const value = 10 ** logV;
				expect(roundToSeries(value, series)).toBe(bruteForce(value, series));
				// a member rounds to itself
				const m = bruteForce(value, series);
				expect(roundToSeries(m, series)).toBe(m);
			}),
			{ numRuns: 3000, seed: 60063 }
		);
	});

	it('property: isInSeries agrees with the nearest member being within 1e-9', () => {
		// [common practice: membership = the nearest-in-log-ratio member equals the value]
		fc.assert(
			fc.property(
				fc.double({ min: -13, max: 10, noNaN: true }),
				fc.constantFrom(...E_SERIES_NAMES),
				fc.constantFrom(0, 1e-12, 5e-10, 2e-9, 1e-3),
				(logV, series, nudge) => {
					const member = roundToSeries(10 ** logV, series) * (1 + nudge);
					expect(isInSeries(member, series)).toBe(Math.abs(nearestInSeries(member, series).relativeChange) < 1e-9);
				}
			),
			{ numRuns: 3000, seed: 192 }
		);
	});
});

