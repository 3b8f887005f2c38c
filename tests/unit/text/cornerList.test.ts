// The corner list of a warning ("Vin nom, Iout nom; Vin nom, Iout nom…" repeated).
import { describe, expect, it } from 'vitest';
import { cornerListText } from '$lib/verdict/cornerList';

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
