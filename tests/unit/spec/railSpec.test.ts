// A rail's defaults become the verification spec of a new revision: missing sections are
// filled from the rail, sections the document has are kept whole, and the result passes the
// engine's own schema, so the stored document is complete.
import { describe, expect, it } from 'vitest';
import { designDocumentSchema } from '$lib/engine/contract/designSchema';
import { DEFAULT_PART_TOLERANCES, RAIL_SPREAD, withRailSpec, type RailSpecSource } from '$lib/spec/railSpec';
import { PART_NAMES } from '$lib/engine/corners/variation';

const rail: RailSpecSource = {
	vinMin: 9,
	vinMax: 16,
	ioutMin: 0.2,
	ioutMax: 3,
	tolerances: { inductorPct: 30, capacitorPct: 25, esrPct: 80, vrefPct: 1 },
	targets: { phaseMarginDeg: 55, gainMarginDb: 8, maxCrossoverFraction: 0.1 }
};
const doc = {
	schemaVersion: 1,
	plant: { topology: 'buck', vin: 12, vout: 3.3, iout: 2, fsw: 500e3, inductor: { l: 4.7e-6, dcr: 0.02 }, capacitors: [{ c: 22e-6, esr: 0.003, count: 3 }] },
	modulator: { vramp: 1 },
	feedback: { vref: 0.6, r1: 10e3 },
	compensator: { kind: 'type3', target: { method: 'k-factor', crossoverHz: 40e3, phaseMarginDeg: 60 } }
};

describe('withRailSpec', () => {
	it('fills targets, operating ranges, tolerances and spread from the rail', () => {
		const out = withRailSpec(doc, rail);
		expect(out.targets).toEqual({ phaseMarginDeg: 55, gainMarginDb: 8, maxCrossoverFraction: 0.1 });
		expect(out.corners).toEqual({ vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } });
		// The rail's percentages become fractions on L, C and ESR; the other parts keep the defaults.
		expect(out.tolerances.l.tol).toBeCloseTo(0.3, 12);
		expect(out.tolerances.c.tol).toBeCloseTo(0.25, 12);
		expect(out.tolerances.esr.tol).toBeCloseTo(0.8, 12);
		expect(out.tolerances.r2).toEqual(DEFAULT_PART_TOLERANCES.r2);
		expect(Object.keys(out.tolerances).sort()).toEqual([...PART_NAMES].sort());
		expect(out.spread).toEqual(RAIL_SPREAD);
		// The nominal stays the document's own.
		expect(out.plant).toBe(doc.plant);
	});

	it('keeps a section the document already has (the engineer’s targets win over the rail)', () => {
		const own = { ...doc, targets: { phaseMarginDeg: 65, gainMarginDb: 10, maxCrossoverFraction: 0.2 }, spread: { samples: 50, seed: 7 } };
		const out = withRailSpec(own, rail);
		expect(out.targets).toBe(own.targets);
		expect(out.spread).toBe(own.spread);
		expect(out.corners).toEqual({ vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } });
	});

	it('gives a document the engine schema accepts, and never mutates its input', () => {
		const before = JSON.stringify(doc);
		const out = withRailSpec(doc, rail);
		expect(designDocumentSchema.safeParse(out).success).toBe(true);
		expect(JSON.stringify(doc)).toBe(before);
	});

	it('caps a rail tolerance at the schema limit of ±90 %', () => {
		const out = withRailSpec(doc, { ...rail, tolerances: { ...rail.tolerances, esrPct: 300 } });
		expect(out.tolerances.esr.tol).toBe(0.9);
		expect(designDocumentSchema.safeParse(out).success).toBe(true);
	});
});
