// Capacitor derating and temperature corners.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '$lib/engine/analyze';
import type { AnalysisResponse } from '$lib/engine/contract/responseSchema';
import { verifyDesign } from '$lib/engine/verify';
import type { Verification } from '$lib/engine/verify/types';
import { COPPER_TEMPCO_PER_C, dcBiasFactor, dcrAt, effectiveCapacitance, rdsOnAt, temperatureClass } from '$lib/engine/plants/derating';

const CASE = join(__dirname, '..', '..', '..', '..', 'reference', 'cases', 'buck-ceramic-1v2.json');
const ceramic = () => JSON.parse(readFileSync(CASE, 'utf8'));

describe('temperature class codes', () => {
	it('reads X7R, X5R, X6S, Y5V and C0G [common practice: EIA-198 class letters as printed on ceramic capacitor data sheets]', () => {
		// X = −55 °C, 7 = +125 °C, R = ±15 %; 5 = +85 °C; S = ±22 %; Y = −30 °C, V = +22/−82 %
		expect(temperatureClass('X7R')).toMatchObject({ code: 'X7R', minC: -55, maxC: 125 });
		expect(temperatureClass('x5r')).toMatchObject({ minC: -55, maxC: 85 });
		expect(temperatureClass('X7R')!.factorAt(125)).toBeCloseTo(0.85, 12);
		expect(temperatureClass('X6S')!.factorAt(-55)).toBeCloseTo(0.78, 12);
		expect(temperatureClass('Y5V')!.factorAt(85)).toBeCloseTo(0.18, 12);
		expect(temperatureClass('X7R')!.factorAt(25)).toBe(1);
		// C0G: 0 ± 30 ppm/°C: at 125 °C at most 100 K × 30 ppm = 0.3 %
		expect(temperatureClass('C0G')!.factorAt(125)).toBeCloseTo(0.997, 12);
		expect(temperatureClass('NP0')!.code).toBe('C0G');
		expect(temperatureClass('X9Q')).toBeNull();
		expect(temperatureClass('ceramic')).toBeNull();
	});
});

describe('DC bias', () => {
	it('the curve C0 / (1 + (V/V0)^k) halves the value at V = V0 [hand-derived]', () => {
		expect(dcBiasFactor(22e-6, { v0: 3, k: 1.7 }, 3)).toBeCloseTo(0.5, 12);
		// 1 / (1 + (5/2.5)^2) = 1/5 [hand-derived]
		expect(dcBiasFactor(10e-6, { v0: 2.5, k: 2 }, 5)).toBeCloseTo(0.2, 12);
	});
	it('measured points: linear from (0 V, C) through the points, held after the last [hand-derived]', () => {
		const bias = { points: [{ v: 4, c: 12e-6 }, { v: 2, c: 18e-6 }] };
		expect(dcBiasFactor(22e-6, bias, 1)).toBeCloseTo(20e-6 / 22e-6, 12); // halfway 22 → 18
		expect(dcBiasFactor(22e-6, bias, 3)).toBeCloseTo(15e-6 / 22e-6, 12); // halfway 18 → 12
		expect(dcBiasFactor(22e-6, bias, 10)).toBeCloseTo(12e-6 / 22e-6, 12);
	});
	it('combines bias, temperature and ageing multiplicatively', () => {
		const e = effectiveCapacitance(22e-6, { dcBias: { v0: 3, k: 1 }, tempClass: 'X7R', ageing: 0.05 }, 3, 125);
		expect(e.effective).toBeCloseTo(22e-6 * 0.5 * 0.85 * 0.95, 18);
	});
});

describe('copper and switch resistance with temperature', () => {
	it('DCR rises 0.393 %/°C [published: CRC Handbook of Chemistry and Physics, copper α ≈ 3.93e-3 /K]', () => {
		expect(COPPER_TEMPCO_PER_C).toBe(0.00393);
		expect(dcrAt(0.01, 125)).toBeCloseTo(0.01 * 1.393, 15);
		expect(dcrAt(0.01, 25)).toBe(0.01);
		expect(rdsOnAt(0.01, 0.004, 100)).toBeCloseTo(0.013, 15);
		expect(rdsOnAt(0.01, undefined, 100)).toBe(0.01);
	});
});

describe('a ceramic-only design with derating', () => {
	it('analyses with the effective value: f0 rises by 1/sqrt(C ratio), the response lists typed and effective', () => {
		const plain = analyzeDesign(ceramic()) as AnalysisResponse;
		const doc = ceramic();
		doc.plant.capacitors[0].dcBias = { v0: 2, k: 1.5 };
		doc.plant.capacitors[0].ageing = 0.05;
		const derated = analyzeDesign(doc) as AnalysisResponse;
		const ratio = derated.capacitorDerating![0].effective / derated.capacitorDerating![0].typed;
		// 1/(1 + (1.2/2)^1.5) · 0.95 at Vout = 1.2 V [hand-derived]
		expect(ratio).toBeCloseTo(0.95 / (1 + Math.pow(0.6, 1.5)), 12);
		// f0 ∝ 1/sqrt(C) for the lossless LC [published: E&M Table 8.2]; losses move it by < 1 %
		expect(derated.features.f0Hz / plain.features.f0Hz).toBeCloseTo(1 / Math.sqrt(ratio), 2);
		expect(plain.capacitorDerating).toBeUndefined();
	});
	it('temperature becomes a corner dimension labelled T min / T max, and the worst PM moves', () => {
		const doc = ceramic();
		doc.plant.capacitors[0].tempClass = 'X5R';
		doc.plant.rdsOnTempco = 0.004;
		const before = verifyDesign(ceramic()) as Verification;
		doc.corners = { ...(doc.corners ?? {}), temperature: { min: -40, max: 85 } };
		const v = verifyDesign(doc) as Verification;
		expect(v.corners.list.map((c) => c.label)).toEqual(expect.arrayContaining(['Vin nom, Iout nom, T nom', 'Vin nom, Iout nom, T min', 'Vin nom, Iout nom, T max']));
		expect(v.corners.list.find((c) => c.label.endsWith('T max'))!.temperatureC).toBe(85);
		expect(v.worst.phaseMarginDeg!.value).not.toBeCloseTo(before.worst.phaseMarginDeg!.value, 3);
	});
	it('a document without derating data keeps its numbers exactly', () => {
		const a = verifyDesign(ceramic()) as Verification;
		const doc = ceramic();
		doc.plant.capacitors[0].ageing = 0;
		const b = verifyDesign(doc) as Verification;
		expect(b.worst).toEqual(a.worst);
	});
	it('names a bad class code and a bad bias curve as field errors', () => {
		const doc = ceramic();
		doc.plant.capacitors[0].tempClass = 'X9Q';
		doc.plant.capacitors[0].dcBias = { v0: -1, k: 2 };
		const r = analyzeDesign(doc) as { error: { fields: Record<string, string> } };
		expect(Object.keys(r.error.fields)).toEqual(expect.arrayContaining(['plant.capacitors.0.tempClass']));
		expect(Object.keys(r.error.fields).some((k) => k.startsWith('plant.capacitors.0.dcBias'))).toBe(true);
	});
});
