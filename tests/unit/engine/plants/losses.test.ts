// Loss breakdown against a hand calculation.
import { describe, expect, it } from 'vitest';
import { lossBreakdown } from '$lib/engine/plants/losses';

describe('loss breakdown', () => {
	/*
	 * Hand calculation [hand-derived from the textbook terms named in plants/losses.ts]:
	 * buck 24 V → 5 V, 3 A, 400 kHz, L = 10 µH, DCR 15 mΩ, RDS(on) 20 mΩ (each switch).
	 *   D ≈ 5/24 = 0.2083; ΔiL = 5·(1 − 0.2083)/(10 µH · 400 kHz) = 0.9896 A
	 *   conduction: (3² + 0.9896²/12)·(0.020 + 0.015) = (9 + 0.08161)·0.035 = 0.31786 W
	 *   switching: ½·24·400k·((3 − 0.4948)·15 ns + (3 + 0.4948)·12 ns) = 4.8e6·(37.578 n + 41.938 n) = 0.38168 W
	 *   Coss 400 pF: 400p·24²·400k = 0.09216 W;  Qrr 20 nC: 20n·24·400k = 0.192 W
	 *   dead time 20 ns, Vf 0.8 V: 0.8·3·2·20n·400k = 0.0384 W;  gate 8 nC at 5 V: 2·8n·5·400k = 0.032 W;  core 0.15 W
	 *   total 1.20410 W; η = 15/(15 + 1.20410) = 92.57 %  — against 99.4 % from conduction alone (the complaint)
	 */
	const base = { topology: 'buck' as const, vin: 24, vout: 5, iout: 3, fswHz: 400e3, dcr: 0.015, rdsOn: 0.02, inductorCurrent: 3, rippleCurrent: (5 * (1 - 5 / 24)) / (10e-6 * 400e3), duty: 5 / 24 };
	it('without part data: conduction only, and says so', () => {
		const r = lossBreakdown(base);
		expect(r.basis).toBe('conduction only');
		expect(Object.keys(r.items)).toEqual(['conduction']);
		expect(r.items.conduction).toBeCloseTo(0.31786, 4);
	});
	it('with part data: every term and the total of the hand calculation', () => {
		const r = lossBreakdown({ ...base, parts: { riseTime: 15e-9, fallTime: 12e-9, coss: 400e-12, qrr: 20e-9, deadTime: 20e-9, bodyDiodeVf: 0.8, qg: 8e-9, gateDrive: 5, coreLoss: 0.15 } });
		expect(r.basis).toBe('conduction and part data');
		expect(r.items.switching).toBeCloseTo(0.38168, 4);
		expect(r.items.coss).toBeCloseTo(0.09216, 6);
		expect(r.items.reverseRecovery).toBeCloseTo(0.192, 9);
		expect(r.items.deadTime).toBeCloseTo(0.0384, 9);
		expect(r.items.gateDrive).toBeCloseTo(0.032, 9);
		expect(r.items.core).toBe(0.15);
		expect(r.total).toBeCloseTo(1.2041, 3);
		expect(r.efficiency).toBeCloseTo(0.9257, 3);
	});
	/*
	 * The same stage with a diode rectifier (one switch) [hand-derived from the terms in plants/losses.ts]:
	 *   conduction: 9.08161·(D·0.020 + 0.015) with D = 5/24: 9.08161·0.0191667 = 0.174064 W (the switch conducts for D only)
	 *   diode Vf 0.5 V: 0.5·3·(1 − 5/24) = 1.1875 W (its average current IL·D′)
	 *   Coss of one switch: ½·400p·24²·400k = 0.04608 W; gate drive of one switch: 8n·5·400k = 0.016 W; no dead-time term
	 */
	it('with a diode rectifier: the diode drop, one switch, no dead time', () => {
		const r = lossBreakdown({ ...base, rectifier: 'diode', parts: { diodeVf: 0.5, coss: 400e-12, deadTime: 20e-9, bodyDiodeVf: 0.8, qg: 8e-9, gateDrive: 5 } });
		expect(r.items.conduction).toBeCloseTo(0.174064, 6);
		expect(r.items.diode).toBeCloseTo(1.1875, 9);
		expect(r.items.coss).toBeCloseTo(0.04608, 9);
		expect(r.items.gateDrive).toBeCloseTo(0.016, 9);
		expect(r.items.deadTime).toBeUndefined();
		// A synchronous stage ignores a rectifier-diode Vf it does not have.
		expect(lossBreakdown({ ...base, parts: { diodeVf: 0.5 } }).items.diode).toBeUndefined();
	});
});

describe('losses in the analysis response', () => {
	it('every response carries the estimate; without part data it says "conduction only"', async () => {
		const { analyzeDesign } = await import('$lib/engine/analyze');
		const { readFileSync } = await import('node:fs');
		const doc = JSON.parse(readFileSync('reference/cases/buck-bank-3v3.json', 'utf8'));
		const plain = analyzeDesign(doc) as { losses: { basis: string; items: Record<string, number> } };
		expect(plain.losses.basis).toBe('conduction only');
		expect(Object.keys(plain.losses.items)).toEqual(['conduction']);
		doc.plant.losses = { riseTime: 10e-9, fallTime: 10e-9 };
		const withParts = analyzeDesign(doc) as { losses: { basis: string; items: Record<string, number> } };
		expect(withParts.losses.basis).toBe('conduction and part data');
		// ½·12 V·400 kHz·(IL·10 ns + IL·10 ns) with IL = 5 A (the ripple terms cancel for tr = tf) [hand-derived]
		expect(withParts.losses.items.switching).toBeCloseTo(0.5 * 12 * 400e3 * 5 * 20e-9, 9);
	}, 60_000);
});
