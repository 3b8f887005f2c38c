// Rounding a network to E-series (§5.4: R1 kept, resistors E96, capacitors E12 by default) and the practical-value
// flags [common practice: R about 1 kΩ–1 MΩ, C about 10 pF–10 µF].
import { describe, expect, it } from 'vitest';
import { partWarnings } from '../../../../src/lib/engine/synthesis/practicality';
import { DEFAULT_SERIES, roundParts } from '../../../../src/lib/engine/synthesis/rounding';

describe('roundParts', () => {
	it('keeps R1 and gm, rounds R2/R3/Rb and C1/C2/C3 to their series', () => {
		// [common practice] values checked by hand against the IEC 60063 E96/E12 lists
		const out = roundParts(
			{ kind: 'type3', r1: 10_012, rb: 4_321, r2: 3_880.4, r3: 538.99, c1: 4.534e-9, c2: 2.444e-10, c3: 1.669e-9 },
			DEFAULT_SERIES
		);
		expect(out).toEqual({ kind: 'type3', r1: 10_012, rb: 4_320, r2: 3_920, r3: 536, c1: 4.7e-9, c2: 2.7e-10, c3: 1.8e-9 });
		const ota = roundParts({ kind: 'type2-ota', r1: 1e4, rb: 1e4, gm: 2.13e-4, r2: 16_312, c1: 5.587e-9, c2: 1.067e-11 }, {
			resistors: 'E24',
			capacitors: null
		});
		expect(ota).toEqual({ kind: 'type2-ota', r1: 1e4, rb: 1e4, gm: 2.13e-4, r2: 16_000, c1: 5.587e-9, c2: 1.067e-11 });
	});

	it('leaves a missing Rb (Vout = Vref) alone', () => {
		expect(roundParts({ kind: 'type1', r1: 1e4, rb: null, c1: 3.3e-9 }, DEFAULT_SERIES).rb).toBeNull();
	});
});

describe('partWarnings', () => {
	it('flags parts outside the practical ranges and only those', () => {
		// [common practice] 1 kΩ and 10 pF themselves are acceptable
		const codes = partWarnings({ kind: 'type3', r1: 1e3, rb: 2e6, r2: 500, r3: 1e6, c1: 22e-6, c2: 10e-12, c3: 4.7e-12 }).map(
			(w) => `${w.code}:${w.part}`
		);
		expect(codes).toEqual(['resistor-out-of-range:r2', 'resistor-out-of-range:rb', 'capacitor-out-of-range:c1', 'capacitor-out-of-range:c3']);
		expect(partWarnings({ kind: 'type3', r1: 1e3, rb: 2e6, r2: 500, r3: 1e6, c1: 22e-6, c2: 10e-12, c3: 4.7e-12 })[0].message).toMatch(
			/R2 = 500 Ω is outside/
		);
	});
});
