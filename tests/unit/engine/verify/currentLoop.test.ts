/**
 * The verdict of a peak current-mode design: the current-loop row fails on subharmonic oscillation
 * at any corner and names the ramp that cures it, cautions on a Qp above 2, and voltage-mode
 * verdicts carry no such row.
 */
import { describe, expect, it } from 'vitest';
import { isContractError, verifyDesign, type Verification } from '../../../../src/lib/engine';

// 5 V → 3.3 V buck (D ≈ 0.67): without a ramp the current loop oscillates at fsw/2 [published:
// Ridley 1991 — peak current mode without slope compensation is unstable above D = 0.5].
const design = (modulator: Record<string, unknown>) => ({
	schemaVersion: 1,
	plant: { topology: 'buck', vin: 5, vout: 3.3, iout: 2, fsw: 500e3, inductor: { l: 2.2e-6, dcr: 0.01 }, capacitors: [{ c: 22e-6, esr: 0.003, count: 3 }], rdsOn: 0.012 },
	modulator,
	feedback: { vref: 0.8, r1: 10000 },
	compensator: { kind: 'type2', target: { method: 'k-factor', crossoverHz: 30e3, phaseMarginDeg: 60 } },
	corners: { vin: { min: 4.5, max: 5.5 } }
});

const verdict = (m: Record<string, unknown>) => {
	const v = verifyDesign(design(m));
	if (isContractError(v)) throw new Error(JSON.stringify(v.error));
	return v as Verification;
};
const row = (v: Verification) => v.rows.find((r) => r.metric === 'current-loop');

describe('current-loop verdict row', () => {
	it('no ramp at D ≈ 0.67: fail, with the slope that cures it in the reason', () => {
		const v = verdict({ control: 'peak-current', senseGain: 0.2, rampSlope: 0 });
		expect(v.status).toBe('fail');
		expect(row(v)?.status).toBe('fail');
		expect(row(v)?.reason).toMatch(/oscillates at fsw\/2.*compensation ramp above/);
	});

	it('a ramp above Sf/2 at every corner: the row passes', () => {
		// Sf = Ri·Vout/L = 0.2·3.3/2.2 µH = 300 kV/s; Se ≥ Sf/2 is the classic sufficient slope
		// [published: Ridley 1991; E&M ch. 12]; 250 kV/s keeps Qp ≤ 2 down to Vin = 4.5 V (D ≈ 0.74).
		const v = verdict({ control: 'peak-current', senseGain: 0.2, rampSlope: 2.5e5 });
		expect(row(v)?.status).toBe('pass');
	});

	it('a ramp stable at every corner but with Qp above 2 at Vin = 4.5 V: caution for the fsw/2 peak', () => {
		// At 4.5 V the boundary (Sf − Sn)/2 is about 95 kV/s; 130 kV/s gives mc·D′ ≈ 0.57, Qp ≈ 4.5.
		const v = verdict({ control: 'peak-current', senseGain: 0.2, rampSlope: 1.3e5 });
		expect(row(v)?.status).toBe('caution');
		expect(row(v)?.reason).toMatch(/Qp = /);
	});

	it('voltage mode has no current-loop row', () => {
		expect(row(verdict({ vramp: 1 }))).toBeUndefined();
	});
});
