import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { roundDecimals, roundSignificant } from '$lib/engine/math';

describe('display rounding', () => {
	it('roundSignificant agrees with Number#toPrecision to one unit in the last kept digit and prints no more digits', () => {
		// [published: ECMA-262 Number.prototype.toPrecision is the reference rounding]
		fc.assert(
			fc.property(fc.double({ min: -1e15, max: 1e15, noNaN: true }).filter((x) => Math.abs(x) > 1e-15), fc.integer({ min: 1, max: 12 }), (x, digits) => {
				const ours = roundSignificant(x, digits);
				const ref = Number(x.toPrecision(digits));
				const unit = 10 ** (Math.floor(Math.log10(Math.abs(ref))) - digits + 1);
				expect(Math.abs(ours - ref)).toBeLessThanOrEqual(unit * (1 + 1e-9));
				// The printed mantissa has at most `digits` significant digits.
				const mantissa = Math.abs(ours).toExponential().split('e')[0].replace('.', '').replace(/^0+/, '');
				expect(mantissa.length).toBeLessThanOrEqual(digits);
			}),
			{ numRuns: 2000, seed: 11 }
		);
	});

	it('keeps 0, ±Infinity and NaN, and rounds dB and degrees to fixed decimals', () => {
		// [hand-derivable]
		expect(roundSignificant(0, 7)).toBe(0);
		expect(roundSignificant(Infinity, 7)).toBe(Infinity);
		expect(Number.isNaN(roundSignificant(NaN, 7))).toBe(true);
		expect(roundSignificant(1.23456789e-5, 7)).toBe(1.234568e-5);
		expect(roundSignificant(-987654321.123, 4)).toBe(-987700000);
		expect(roundDecimals(-23.456789, 4)).toBe(-23.4568);
		expect(roundDecimals(179.99996, 4)).toBe(180);
		expect(JSON.stringify(roundDecimals(-0.1 - 0.2, 4))).toBe('-0.3');
	});
});
