// Engineering-notation input: the forms the trade types (SPICE suffixes, SI prefixes, the
// resistor-code infix `4k7`), the M/m/MEG case rule, and errors that name their rule.
import { describe, expect, it } from 'vitest';
import { parseEng, parseQuantity, type UnitSymbol } from '$lib/units';

function value(text: string, unit?: UnitSymbol) {
	const r = parseEng(text, { unit });
	if (!r.ok) throw new Error(`${text}: ${r.error}`);
	return r.value;
}
const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(Math.abs(b) * 1e-12);

describe('parseEng accepts the notations engineers type', () => {
	// Prefix values are SI definitions and SPICE suffix conventions [common practice].
	it.each([
		['4.7u', 4.7e-6],
		['4.7µ', 4.7e-6],
		['4.7μ', 4.7e-6],
		['4.7e-6', 4.7e-6],
		['4.7E-6', 4.7e-6],
		['22m', 22e-3],
		['1.2MEG', 1.2e6],
		['1.2meg', 1.2e6],
		['4k7', 4.7e3],
		['4R7', 4.7],
		['1MEG5', 1.5e6],
		['2.2K', 2.2e3],
		['100n', 100e-9],
		['100p', 100e-12],
		['3f', 3e-15],
		['1.5G', 1.5e9],
		['2T', 2e12],
		['.5m', 0.5e-3],
		['10.', 10],
		['-3.3', -3.3],
		['\u22123.3n', -3.3e-9],
		['  47 u ', 47e-6]
	])('%s = %d', (text, expected) => close(value(text), expected));

	it('takes the field unit, with or without a space, in common spellings', () => {
		close(value('4.7uF', 'F'), 4.7e-6);
		close(value('4.7 µF', 'F'), 4.7e-6);
		close(value('100pf', 'F'), 100e-12);
		close(value('22mΩ', 'Ω'), 22e-3);
		close(value('22mohm', 'Ω'), 22e-3);
		close(value('10 ohms', 'Ω'), 10);
		close(value('450kHz', 'Hz'), 450e3);
		close(value('450khz', 'Hz'), 450e3);
		close(value('1.2MEGHz', 'Hz'), 1.2e6);
		close(value('1uH', 'H'), 1e-6);
		close(value('4k7Ω', 'Ω'), 4.7e3);
		close(value('12V', 'V'), 12);
		close(value('8A', 'A'), 8);
		close(value('2.5us', 's'), 2.5e-6);
	});

	it('reads M as mega and m as milli (the documented case rule, not SPICE case folding)', () => {
		close(value('1M'), 1e6);
		close(value('1m'), 1e-3);
		close(value('1MHz', 'Hz'), 1e6);
		close(value('1mHz', 'Hz'), 1e-3);
	});

	it('reads a bare F in a farad field as farads, not femto', () => close(value('1F', 'F'), 1));
	it('keeps s (second) and S (siemens) apart', () => {
		close(value('1ms', 's'), 1e-3);
		expect(parseEng('1mS', { unit: 's' }).ok).toBe(false);
		close(value('1mS', 'S'), 1e-3);
	});
	it('never returns -0', () => expect(Object.is(value('-0'), 0)).toBe(true));
});

describe('parseEng rejects what it cannot read, naming the rule', () => {
	const error = (text: string, unit?: UnitSymbol) => {
		const r = parseEng(text, { unit });
		expect(r.ok, text).toBe(false);
		return r.ok ? '' : r.error;
	};
	it.each(['', '   ', 'abc', 'u', 'k7', '.', '-', 'e5', '1e', '1..2', '4.7x', '1 2', 'NaN', 'Infinity', '0x10', '1_000'])(
		'%j is refused',
		(text) => expect(error(text).length).toBeGreaterThan(5)
	);
	it('explains an ambiguous P', () => expect(error('100P')).toMatch(/pico/));
	it('explains a decimal comma', () => expect(error('4,7u')).toMatch(/point/));
	it('refuses an exponent together with a prefix', () => expect(error('1e3k')).toMatch(/exponent or a prefix/));
	it('names the unit mix-up', () => expect(error('4.7uF', 'H')).toBe('this field is in H, not F'));
	it('lists the prefixes it knows for an unknown one', () => expect(error('4.7x')).toMatch(/µ/));
	it('refuses overflow instead of returning Infinity', () => expect(error('1e400')).toMatch(/finite/));
});

describe('parseQuantity checks the field range', () => {
	it('refuses zero and negatives for a positive part', () => {
		const r = parseQuantity('0', { unit: 'H', positive: true });
		expect(r).toEqual({ ok: false, error: 'must be > 0' });
		expect(parseQuantity('-1u', { unit: 'H', positive: true }).ok).toBe(false);
	});
	it('allows zero where asked (ESL unknown)', () => expect(parseQuantity('0', { unit: 'H', positive: true, allowZero: true })).toEqual({ ok: true, value: 0 }));
	it('reports the limit in engineering notation', () => {
		const r = parseQuantity('2', { unit: 'V', max: 1 });
		expect(r).toEqual({ ok: false, error: 'must be ≤ 1 V' });
	});
	it('checks whole numbers', () => expect(parseQuantity('2.5', { integer: true }).ok).toBe(false));
});
