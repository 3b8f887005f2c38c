// Light-load behaviour as an input. CCM/DCM boundary Iout,crit = V(1 − D)/(2L·fsw)
// for the buck [published: E&M Ch. 5, §5.1].
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '$lib/engine/analyze';
import type { AnalysisResponse } from '$lib/engine/contract/responseSchema';
import { verifyDesign } from '$lib/engine/verify';
import type { Verification } from '$lib/engine/verify/types';

const CASE = join(__dirname, '..', '..', '..', '..', 'reference', 'cases', 'buck-ceramic-1v2.json');
const doc = (lightLoad?: string, ioutMin?: number) => {
	const d = JSON.parse(readFileSync(CASE, 'utf8'));
	if (lightLoad) d.plant.lightLoad = lightLoad;
	if (ioutMin !== undefined) d.corners = { ...(d.corners ?? {}), iout: { min: ioutMin, max: d.plant.iout } };
	return d;
};

describe('light load', () => {
	const base = analyzeDesign(doc()) as AnalysisResponse;
	const d0 = doc();
	const iCrit = (d0.plant.vout * (1 - base.operatingPoint.duty)) / (2 * d0.plant.inductor.l * d0.plant.fsw);
	const onePercent = 0.01 * d0.plant.iout;

	it('the 1 % load is below the CCM boundary of this buck [published: E&M §5.1]', () => {
		expect(onePercent).toBeLessThan(iCrit);
		expect(base.operatingPoint.criticalLoadCurrent).toBeCloseTo(iCrit, 2);
	});

	it('forced CCM at 1 % load: analysed as CCM, no DCM caveat, and the verdict has no model caution', () => {
		const d = doc('forced-ccm');
		d.plant.iout = onePercent;
		const r = analyzeDesign(d) as AnalysisResponse;
		expect(r.operatingPoint.mode).toBe('ccm');
		expect(r.warnings.map((w) => w.code)).not.toEqual(expect.arrayContaining(['dcm-operating-point']));
		expect(r.warnings.map((w) => w.code)).not.toContain('near-ccm-boundary');
		const v = verifyDesign(doc('forced-ccm', onePercent)) as Verification;
		expect(v.rows.find((x) => x.metric === 'model')!.status).toBe('pass');
		expect(v.corners.list.some((c) => c.label.includes('Iout min'))).toBe(true);
	});

	it('without the input the DCM corner is warned about as before (numbers unchanged)', () => {
		const v = verifyDesign(doc(undefined, onePercent)) as Verification;
		const model = v.rows.find((x) => x.metric === 'model')!;
		expect(model.status).toBe('caution');
		expect(model.reason).toMatch(/discontinuous/);
	});

	it('diode emulation: the DCM corner is analysed with the DCM averaged model (plants/dcmModel.ts) and counted', () => {
		const v = verifyDesign(doc('diode-emulation', onePercent)) as Verification;
		const light = v.corners.list.filter((c) => c.label.includes('Iout min'));
		expect(light.length).toBeGreaterThan(0);
		for (const c of light) {
			expect(c.warnings).toContain('dcm-averaged-model');
			expect(c.warnings).not.toContain('dcm-outside-model');
		}
		expect(v.warnings.find((w) => w.code === 'dcm-averaged-model')!.message).toMatch(/^Discontinuous conduction with diode emulation/);
		const forced = verifyDesign(doc('forced-ccm', onePercent)) as Verification;
		expect(v.corners.count).toBe(forced.corners.count);
	});
});
