/**
 * Tolerances of the current loop's own parts: the sense gain Ri and the compensation ramp Se are
 * corners and spread parts in peak current mode (the ramp Vpp is not: it does not exist there),
 * and each moves what the published model says it moves.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesignDetailed, isContractError, verifyDesign, type Verification } from '../../../../src/lib/engine';
import { loopSpecFromDetail, buildLoop } from '../../../../src/lib/engine/corners/loopModel';
import { applyVariation, partLabel, partsPresent } from '../../../../src/lib/engine/corners/variation';
import { designDocumentSchema } from '../../../../src/lib/engine/contract/designSchema';
import { resolveParameters } from '../../../../src/lib/engine/fit/parameters';
import { designSensitivity } from '../../../../src/lib/engine/sensitivity';
import { evaluatePolar } from '../../../../src/lib/engine/tf/evaluate';
import type { AnalysisDetail } from '../../../../src/lib/engine/analyze';

// 5 V → 3.3 V, 2 A buck at 500 kHz (D ≈ 0.67), invented values of a point-of-load stage.
const design = (modulator: Record<string, unknown>, extra: Record<string, unknown> = {}) => ({
	schemaVersion: 1,
	plant: { topology: 'buck', vin: 5, vout: 3.3, iout: 2, fsw: 500e3, inductor: { l: 2.2e-6, dcr: 0.01 }, capacitors: [{ c: 22e-6, esr: 0.003, count: 3 }], rdsOn: 0.012 },
	modulator,
	feedback: { vref: 0.8, r1: 10000 },
	compensator: { kind: 'type2', target: { method: 'k-factor', crossoverHz: 30e3, phaseMarginDeg: 60 } },
	...extra
});
const detail = (doc: unknown) => {
	const d = analyzeDesignDetailed(doc);
	if (isContractError(d)) throw new Error(JSON.stringify(d.error));
	return d as AnalysisDetail;
};
const verdict = (doc: unknown) => {
	const v = verifyDesign(doc);
	if (isContractError(v)) throw new Error(JSON.stringify(v.error));
	return v as Verification;
};

describe('Ri and Se tolerances', () => {
	it('peak current mode varies Ri and Se (Se only when there is a ramp); voltage mode varies the ramp Vpp', () => {
		expect(partsPresent(loopSpecFromDetail(detail(design({ control: 'peak-current', senseGain: 0.2, rampSlope: 2e5 }))))).toEqual(expect.arrayContaining(['senseGain', 'rampSlope']));
		const noRamp = partsPresent(loopSpecFromDetail(detail(design({ control: 'peak-current', senseGain: 0.2, rampSlope: 0 }))));
		expect(noRamp).toContain('senseGain');
		expect(noRamp).not.toContain('rampSlope');
		expect(noRamp).not.toContain('vramp');
		const vm = partsPresent(loopSpecFromDetail(detail(design({ vramp: 1 }))));
		expect(vm).toContain('vramp');
		expect(vm).not.toContain('senseGain');
	});

	it('Ri +10 % lowers the low-frequency gain of Gvc as the published DC gain (R/Ri)/(1 + R·Ts/L·(mc·D′ − 0.5)) says', () => {
		// [published: Ridley 1991, DC gain of the control-to-output response, from memory]; mc = 1 + Se/Sn
		// with Sn ∝ Ri, so mc falls as Ri rises. DCR and RDS(on) move the engine's figure a little (< 0.1 dB here).
		const spec = loopSpecFromDetail(detail(design({ control: 'peak-current', senseGain: 0.2, rampSlope: 2e5 })));
		const dcDb = (s: typeof spec) => evaluatePolar(buildLoop(s).plant.gvd, 2 * Math.PI * 1).magDb;
		const R = 3.3 / 2;
		const Ts = 1 / 500e3;
		const L = 2.2e-6;
		const D = 3.3 / 5;
		const ridley = (ri: number) => {
			const sn = (ri * (5 - 3.3)) / L;
			const mc = 1 + 2e5 / sn;
			return R / ri / (1 + (R * Ts * (mc * (1 - D) - 0.5)) / L);
		};
		const expected = 20 * Math.log10(ridley(0.22) / ridley(0.2));
		const got = dcDb(applyVariation(spec, { factors: { senseGain: 1.1 } })) - dcDb(spec);
		expect(got).toBeLessThan(0);
		expect(Math.abs(got - expected)).toBeLessThan(0.1);
	});

	it('a ramp stable at its nominal slope but not at −20 % fails the current-loop row at the Se corner', () => {
		// Boundary (Sf − Sn)/2 ≈ 76 kV/s at this duty with its conduction losses [published: Ridley 1991 —
		// stable iff mc·D′ > 0.5]; 85 kV/s is above it (Qp large: caution), 68 kV/s below (oscillation).
		const row = (v: Verification) => v.rows.find((r) => r.metric === 'current-loop')!;
		const m = { control: 'peak-current', senseGain: 0.2, rampSlope: 85e3 };
		expect(row(verdict(design(m))).status).toBe('caution');
		const toleranced = verdict(design(m, { tolerances: { rampSlope: { tol: 0.2 } } }));
		expect(row(toleranced).status).toBe('fail');
		expect(row(toleranced).corner).toMatch(/Se −20/);
		// Ri −10 % steepens nothing the ramp does not also scale: the same ratio Se/Sn rises, mc rises, it stays stable.
		const riOnly = verdict(design(m, { tolerances: { senseGain: { tol: 0.1 } } }));
		expect(row(riOnly).status).toBe('caution');
	});

	it('names Ri and Se alike in the corner labels, the sensitivity rows and the fit parameters', () => {
		// [common practice: Ri and Se are the trade's symbols of the sense gain and the compensation ramp]
		const doc = design({ control: 'peak-current', senseGain: 0.2, rampSlope: 2e5 }, { tolerances: { senseGain: { tol: 0.1 }, rampSlope: { tol: 0.2 } } });
		const corners = verdict(doc).corners.list.map((c) => c.label).join('; ');
		expect(corners).toMatch(/Ri [+−]10 %/);
		expect(corners).toMatch(/Se [+−]20 %/);
		const sensitivity = designSensitivity(designDocumentSchema.parse(doc));
		if ('error' in sensitivity) throw new Error(sensitivity.error.message);
		expect(sensitivity.rows.filter((r) => r.parameter === 'senseGain' || r.parameter === 'rampSlope').map((r) => r.label).sort()).toEqual(['Ri', 'Se']);
		const fitted = resolveParameters([{ name: 'senseGain' }, { name: 'rampSlope' }], loopSpecFromDetail(detail(doc)), designDocumentSchema.parse(doc), false);
		expect(fitted.ok && fitted.parameters.map((p) => p.label)).toEqual(['Ri', 'Se']);
		// The one name list: a second capacitor branch and the delay as the fit and sensitivities name them.
		expect([partLabel('c', 1, 2), partLabel('esr', 0, 1), partLabel('delay')]).toEqual(['C (branch 2)', 'ESR', 'Loop delay']);
	});
});
