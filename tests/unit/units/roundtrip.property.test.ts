// Property tests: whatever we display can be typed back and means the same value (within the
// displayed rounding), and no input text ever yields NaN or Infinity.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatEng, formatForInput, parseEng, type UnitSymbol } from '$lib/units';

const units: UnitSymbol[] = ['', 'V', 'A', 'Ω', 'H', 'F', 'Hz', 's', 'S', 'W'];
// Magnitudes a power-supply design meets, and well beyond (fF … far past THz).
const magnitude = fc.double({ min: -20, max: 20, noNaN: true }).map((e) => 10 ** e);
const signed = fc.tuple(magnitude, fc.boolean()).map(([m, negative]) => (negative ? -m : m));

describe('format → parse round trip', () => {
	it('formatEng output parses back within half a unit in the last shown digit', () => {
		fc.assert(
			fc.property(signed, fc.constantFrom(...units), fc.integer({ min: 1, max: 6 }), (v, unit, digits) => {
				const shown = formatEng(v, unit, { digits });
				const back = parseEng(shown, { unit });
				expect(back.ok, shown).toBe(true);
				if (!back.ok) return;
				// Rounding to d significant figures moves a value by at most 0.5·10^(1−d) relative.
				expect(Math.abs(back.value - v)).toBeLessThanOrEqual(Math.abs(v) * 0.5 * 10 ** (1 - digits) * (1 + 1e-9));
			}),
			{ numRuns: 400 }
		);
	});

	it('the input form (no gap) parses back too', () => {
		fc.assert(
			fc.property(signed, fc.constantFrom(...units), (v, unit) => {
				const back = parseEng(formatForInput(v, unit), { unit });
				expect(back.ok).toBe(true);
				if (back.ok) expect(Math.abs(back.value - v)).toBeLessThanOrEqual(Math.abs(v) * 5e-4 * (1 + 1e-9));
			}),
			{ numRuns: 300 }
		);
	});

	it('shows µ, never u, and at most the asked significant figures', () => {
		fc.assert(
			fc.property(signed, fc.integer({ min: 1, max: 6 }), (v, digits) => {
				const shown = formatEng(v, 'F', { digits });
				expect(shown).not.toMatch(/u/);
				// Trailing zeros of a whole mantissa ("990m" for 0.99 at 2 figures) are placeholders, not figures.
				const mantissa = shown.replace(/e.*$/, '').replace(/[^\d]/g, '').replace(/^0+/, '').replace(/0+$/, '');
				expect(mantissa.length).toBeLessThanOrEqual(digits);
			}),
			{ numRuns: 300 }
		);
	});
});

describe('parseEng on arbitrary text', () => {
	it('returns a finite number or a message, never NaN, never throws', () => {
		const alphabet = fc.constantFrom(...'0123456789.eE+-−kKmMuUµnpfGTRgΩHzFs ,x'.split(''));
		fc.assert(
			fc.property(fc.oneof(fc.string(), fc.string({ unit: alphabet, maxLength: 12 })), fc.constantFrom(...units), (text, unit) => {
				const r = parseEng(text, { unit });
				if (r.ok) expect(Number.isFinite(r.value)).toBe(true);
				else expect(r.error.length).toBeGreaterThan(5);
			}),
			{ numRuns: 2000 }
		);
	});

	it('rejects text without any digit', () => {
		const letters = fc.string({ unit: fc.constantFrom(...'abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZµΩ .+-'.split('')), minLength: 1, maxLength: 8 });
		fc.assert(
			fc.property(letters, (s) => {
				expect(parseEng(s).ok).toBe(false);
			}),
			{ numRuns: 300 }
		);
	});
});

describe('formatEng examples from the identity sheet', () => {
	// The display conventions written in the project's identity notes [common practice].
	it.each([
		[4.7e-6, 'H', '4.7 µH'],
		[22e-3, 'Ω', '22 mΩ'],
		[450e3, 'Hz', '450 kHz'],
		[0, 'V', '0 V'],
		[1987.4, 'Ω', '1.99 kΩ']
	] as const)('%d %s → %s', (v, unit, text) => expect(formatEng(v, unit)).toBe(text));
	it('gives component values 4 figures', () => expect(formatEng(1987.4, 'Ω', { digits: 4 })).toBe('1.987 kΩ'));
	it('falls back to an exponent outside f…T', () => expect(formatEng(1.2e18, 'Hz')).toBe('1.2e+18 Hz'));
	it('shows a dash for a missing value', () => {
		expect(formatEng(null)).toBe('–');
		expect(formatEng(Number.NaN)).toBe('–');
	});
});
