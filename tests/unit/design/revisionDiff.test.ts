// The History panel's parameter differences: every changed leaf of two design documents by its
// contract path, and the values shown in engineering notation with the field's unit.
import { describe, expect, it } from 'vitest';
import { diffDocuments, formatChangeValue } from '$lib/design/revisionDiff';
import { contractExample } from '../support/contractExample';

// The contract's example document without its parts and sweep (a placed network, the default grid).
const { sweep: _sweep, compensator: exampleCompensator, ...exampleRest } = contractExample();
const { parts: _parts, ...compensator } = exampleCompensator;
const base = { ...exampleRest, compensator };
const copy = () => structuredClone(base);

describe('diffDocuments', () => {
	it('finds nothing between a document and its copy', () => {
		expect(diffDocuments(base, copy())).toEqual([]);
	});

	it('names a changed inductor by its contract path with both values', () => {
		const b = copy();
		b.plant.inductor.l = 2.2e-6;
		expect(diffDocuments(base, b)).toEqual([{ path: 'plant.inductor.l', before: 1e-6, after: 2.2e-6 }]);
	});

	it('indexes capacitor branches and lists a branch present on one side only, leaf by leaf', () => {
		const b = copy();
		b.plant.capacitors[0].esr = 0.003;
		b.plant.capacitors.push({ c: 100e-9, esr: 0.01, esl: 0, count: 2 });
		const paths = diffDocuments(base, b);
		expect(paths[0]).toEqual({ path: 'plant.capacitors.0.esr', before: 0.002, after: 0.003 });
		expect(paths.slice(1).map((c) => c.path)).toEqual(['plant.capacitors.1.c', 'plant.capacitors.1.esr', 'plant.capacitors.1.esl', 'plant.capacitors.1.count']);
		expect(paths.slice(1).every((c) => c.before === undefined)).toBe(true);
	});

	it('reports strings, booleans and removed fields', () => {
		const b = JSON.parse(JSON.stringify(base));
		b.compensator.kind = 'type2';
		b.modulator.feedForward = true;
		delete b.plant.rdsOn;
		expect(diffDocuments(base, b)).toEqual([
			{ path: 'plant.rdsOn', before: 0.006, after: undefined },
			{ path: 'modulator.feedForward', before: false, after: true },
			{ path: 'compensator.kind', before: 'type3', after: 'type2' }
		]);
	});
});

describe('formatChangeValue', () => {
	// Engineering notation with the SI prefix and the field's unit [common practice].
	it('shows component values with 4 figures and their unit', () => {
		expect(formatChangeValue('plant.inductor.l', 4.7e-6)).toBe('4.7 µH');
		expect(formatChangeValue('plant.capacitors.0.esr', 0.022)).toBe('22 mΩ');
		expect(formatChangeValue('plant.capacitors.0.c', 4.7e-6)).toBe('4.7 µF');
		expect(formatChangeValue('feedback.r1', 10000)).toBe('10 kΩ');
		expect(formatChangeValue('compensator.parts.c2', 2.2e-10)).toBe('220 pF');
	});
	it('shows frequencies, voltages, angles and words', () => {
		expect(formatChangeValue('plant.fsw', 450000)).toBe('450 kHz');
		expect(formatChangeValue('compensator.target.crossoverHz', 60000)).toBe('60 kHz');
		expect(formatChangeValue('plant.vin', 12)).toBe('12 V');
		expect(formatChangeValue('compensator.target.phaseMarginDeg', 55)).toBe('55.0°');
		expect(formatChangeValue('compensator.kind', 'type2')).toBe('type2');
		expect(formatChangeValue('plant.rdsOn', undefined)).toBe('(none)');
	});
});
