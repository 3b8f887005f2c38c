import { describe, expect, it } from 'vitest';
import { runCorners } from '../../../../src/lib/engine/corners/corners';
import { loopSpecFromDetail } from '../../../../src/lib/engine/corners/loopModel';
import { applyVariation, partsPresent } from '../../../../src/lib/engine/corners/variation';
import { cornersSchema, tolerancesSchema } from '../../../../src/lib/engine/corners/schema';
import { detail } from '../closedloop/helpers';

describe('corners', () => {
	it('runs every Vin × Iout × tolerance sign combination and names the corner that sets each worst value', () => {
		const spec = loopSpecFromDetail(detail('buck-ceramic-1v2'));
		const r = runCorners(spec, { vin: { min: 4.5, max: 5.5 }, iout: { min: 1, max: 8 }, tolerances: { l: 0.2, c: 0.2, c1: 0.1 } }, [1e3, 1e4, 1e5]);
		expect(r.mode).toBe('exhaustive');
		// the one corner set: Vin {min, nom, max} × Iout {min, nom, max} × 2³ tolerance signs, plus the nominal;
		// this design's Iout nom is 8 A = Iout max, so that level is kept once
		expect(spec.stage.iout).toBe(8);
		expect(r.corners).toHaveLength(1 + 3 * 2 * 8);
		expect(new Set(r.corners.map((c) => c.label)).size).toBe(r.corners.length);
		expect(r.corners[0].label).toBe('Vin nom, Iout nom');
		expect(r.corners.map((c) => c.label)).toContain('Vin max, Iout min, L +20 %, C −20 %, C1 +10 %');
		const pms = r.corners.map((c) => c.phaseMarginDeg!);
		expect(r.worst.phaseMarginDeg!.value).toBe(Math.min(...pms));
		expect(r.worst.crossoverHighHz!.value).toBe(Math.max(...r.corners.map((c) => c.crossoverHz!)));
		expect(r.traces.map((t) => t.label)).toContain('worst phase margin');
		// VM buck without feed-forward: loop gain ∝ Vg (Gd0 = Vg·R/(R + r)), so fc is highest at Vin max [formula sheet §1.3, §3]
		expect(r.worst.crossoverHighHz!.corner.vin).toBe(5.5);
		expect(r.worst.crossoverLowHz!.corner.vin).toBe(4.5);
	});

	it('with input feed-forward the buck loop gain does not depend on Vin [formula sheet §3: Fm·Gd0 = R/(kff(R + r))]', () => {
		const spec = loopSpecFromDetail(detail('buck-heavy-ff-delay-1v0'));
		const r = runCorners(spec, { vin: { min: 9, max: 15 } });
		const fcs = r.corners.map((c) => c.crossoverHz!);
		for (const fc of fcs) expect(fc / fcs[0]).toBeCloseTo(1, 9);
	});

	it('falls back to one part at a time plus linearised worst cases when the exhaustive set is too large', () => {
		const spec = loopSpecFromDetail(detail('buck-bank-3v3'));
		const tol = { l: 0.2, c: 0.2, esr: 0.3, esl: 0.3, dcr: 0.1, r2: 0.01, r3: 0.01, c1: 0.1, c2: 0.1, c3: 0.1 };
		const r = runCorners(spec, { vin: { min: 10, max: 14 }, tolerances: tol, maxCorners: 64 });
		expect(r.mode).toBe('one-at-a-time');
		// per operating point: centre + 2 per part + 4 linearised worst (the nominal is the nominal operating point's centre)
		expect(r.corners).toHaveLength(3 * (1 + 2 * 10 + 4));
		// The linearised worst PM corner is at least as bad as every single-part corner at its operating point
		const lin = r.corners.filter((c) => c.kind === 'linearised-worst');
		expect(lin.length).toBe(12);
		const worstSingle = Math.min(...r.corners.filter((c) => c.kind === 'one-at-a-time').map((c) => c.phaseMarginDeg!));
		expect(r.worst.phaseMarginDeg!.value).toBeLessThanOrEqual(worstSingle);
	});

	it('reports a corner the model cannot reach instead of crashing (duty limit at low Vin)', () => {
		const spec = loopSpecFromDetail(detail('buck-lossy-light-5v'));
		const r = runCorners(spec, { vin: { min: 5.1, max: 30 } });
		expect(r.failedCorners).toBe(1);
		expect(r.corners.find((c) => c.error)!.error).toMatch(/duty/);
		expect(r.worst.phaseMarginDeg).not.toBeNull();
	});

	it('applies tolerances only to parts the loop has', () => {
		const spec = loopSpecFromDetail(detail('buck-lossy-light-5v'));
		expect(partsPresent(spec)).not.toContain('r3');
		const v = applyVariation(spec, { factors: { c: 1.2, r2: 0.9 } });
		expect(v.stage.capacitors[0].c).toBeCloseTo(spec.stage.capacitors[0].c * 1.2, 15);
		expect((v.parts as { r2: number }).r2).toBeCloseTo((spec.parts as { r2: number }).r2 * 0.9, 9);
		expect(spec.stage.capacitors[0].c).toBe(1e-4); // the input is not modified
	});
});

describe('corner and tolerance schemas', () => {
	it('names the field and the rule', () => {
		const bad = cornersSchema.safeParse({ vin: { min: 6, max: 4 } });
		expect(bad.success).toBe(false);
		expect(bad.error!.issues[0].path).toEqual(['vin', 'min']);
		const t = tolerancesSchema.safeParse({ l: { tol: 1.5 } });
		expect(t.success).toBe(false);
		expect(t.error!.issues[0].path).toEqual(['l', 'tol']);
		expect(tolerancesSchema.safeParse({ inductor: { tol: 0.1 } }).success).toBe(false);
		expect(tolerancesSchema.parse({ l: { tol: 0.1 } }).l).toEqual({ tol: 0.1, dist: 'uniform', sigmas: 3 });
	});
});
