// The corner list of a warning ("Vin nom, Iout nom; Vin nom, Iout nom…" repeated).
import { describe, expect, it } from 'vitest';
import { cornerListText, operatingPointOf, reasonBesideCorner, splitCornerLabel, warningWhereText } from '$lib/verdict/cornerList';
import { cornerLabel } from '$lib/engine/corners/operatingCases';

describe('cornerListText', () => {
	it('names each operating point once, with the count of tolerance cases behind it', () => {
		const labels = ['Vin nom, Iout nom', 'Vin nom, Iout nom, L −20 %', 'Vin nom, Iout nom, L +20 %, C −20 %', 'Vin min, Iout max, L +20 %'];
		const text = cornerListText(labels);
		expect(text).toBe('Vin nom, Iout nom (3 tolerance cases); Vin min, Iout max, L +20 %');
		expect(text.match(/Vin nom, Iout nom/g)).toHaveLength(1);
	});
	it('drops exact duplicates, says "every corner" and caps the groups', () => {
		expect(cornerListText(['Vin nom, Iout nom', 'Vin nom, Iout nom'])).toBe('Vin nom, Iout nom');
		expect(cornerListText(['a', 'b', 'c'], { total: 3 })).toBe('every corner (3)');
		const many = ['Vin min, Iout min', 'Vin min, Iout max', 'Vin max, Iout min', 'Vin max, Iout max', 'Vin nom, Iout max'];
		expect(cornerListText(many)).toBe('Vin min, Iout min; Vin min, Iout max; Vin max, Iout min; and 2 more operating points');
		expect(cornerListText([])).toBe('');
	});
});

describe('splitCornerLabel', () => {
	// The labels come from the engine's one formatter, so a change of its wording breaks these.
	it('keeps Vin, Iout and temperature as the operating point and the rest as part tolerances', () => {
		const label = cornerLabel({ vinCase: 'max', ioutCase: 'min', tempCase: 'max', factors: { l: 0.8, dcr: 0.9 } });
		const { operating, parts } = splitCornerLabel(label);
		expect(operating).toBe('Vin max, Iout min, T max');
		expect(parts).toEqual(['L −20 %', 'DCR −10 %']);
		expect([operating, ...parts].join(', ')).toBe(label);
		expect(operatingPointOf(label)).toBe(operating);
	});
	it('gives a label without an operating point back whole', () => {
		expect(splitCornerLabel('nominal')).toEqual({ operating: 'nominal', parts: [] });
		expect(splitCornerLabel(cornerLabel({ vinCase: 'nom', ioutCase: 'nom' }))).toEqual({ operating: 'Vin nom, Iout nom', parts: [] });
	});
});

describe('reasonBesideCorner and warningWhereText', () => {
	it('replaces a long corner name in a reason by "the corner shown", and leaves other reasons alone', () => {
		const corner = cornerLabel({ vinCase: 'max', ioutCase: 'min', factors: { l: 0.8, c: 0.7 } });
		expect(reasonBesideCorner(`Worst PM 41.9° at ${corner} is below the 50.0° target.`, corner)).toBe('Worst PM 41.9° at the corner shown is below the 50.0° target.');
		expect(reasonBesideCorner('No corner could be analysed.', null)).toBe('No corner could be analysed.');
	});
	it('says where a warning appeared as its own sentence', () => {
		expect(warningWhereText(['Vin nom, Iout nom'])).toBe('At Vin nom, Iout nom.');
		expect(warningWhereText([])).toBe('');
	});
});
