import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { designSensitivity, type SensitivityReport } from '$lib/engine/sensitivity';
import { designDocumentSchema } from '$lib/engine/contract/designSchema';
import { analyzeValidatedDesign, type AnalysisDetail } from '$lib/engine/analyze';
import { loopSpecFromDetail } from '$lib/engine/corners/loopModel';
import { evaluateVariant, runCorners } from '$lib/engine/corners/corners';

const caseDoc = (name: string, extra: Record<string, unknown> = {}) =>
	designDocumentSchema.parse({ ...JSON.parse(readFileSync(`reference/cases/${name}.json`, 'utf8')), ...extra });
const report = (doc: ReturnType<typeof caseDoc>) => designSensitivity(doc) as SensitivityReport;
const specOf = (doc: ReturnType<typeof caseDoc>) => loopSpecFromDetail(analyzeValidatedDesign(doc) as AnalysisDetail);

describe('sensitivity of the margins to every part', () => {
	it('agrees with ±10 % finite differences of the corner code for every part of a two-branch Type III buck', () => {
		const doc = caseDoc('buck-bank-3v3');
		const r = report(doc);
		const spec = specOf(doc);
		expect(r.rows.length).toBeGreaterThanOrEqual(10);
		for (const row of r.rows) {
			if (row.parameter === 'delay') continue;
			const up = evaluateVariant(spec, { factors: { [row.parameter]: 1.1 } });
			const down = evaluateVariant(spec, { factors: { [row.parameter]: 1 / 1.1 } });
			// Secant over ±10 % against the derivative [common practice: a smooth figure's central difference].
			const secantPm = (up.phaseMarginDeg! - down.phaseMarginDeg!) / 2;
			expect(Math.abs(row.perTenPercent.phaseMarginDeg! - secantPm)).toBeLessThan(0.03 * Math.abs(secantPm) + 0.02);
			const secantFc = (100 * Math.log(up.crossoverHz! / down.crossoverHz!)) / 2;
			expect(Math.abs(row.perTenPercent.crossoverPct! - secantFc)).toBeLessThan(0.03 * Math.abs(secantFc) + 0.02);
		}
	});

	it('gives the textbook slopes of the ramp and the loop delay exactly', () => {
		const doc = caseDoc('buck-heavy-ff-delay-1v0');
		const r = report(doc);
		const ramp = r.rows.find((x) => x.parameter === 'vramp')!;
		// Fm = 1/Vramp scales |T| only: GM rises by 20·log10(1.1) = 0.828 dB per +10 % [common practice: GM = −20·log10|T(f180)|].
		expect(ramp.perTenPercent.gainMarginDb).toBeCloseTo(20 * Math.log10(1.1), 4);
		const delay = r.rows.find((x) => x.parameter === 'delay')!;
		// e^(−sTd) takes 360°·fc·Td of phase at fc and leaves |T| alone [published: docs/formulas.md §3; E&M §7.6 loop delay].
		const td = doc.modulator.delay;
		expect(delay.perTenPercent.phaseMarginDeg).toBeCloseTo(-360 * r.nominal.crossoverHz! * td * Math.log(1.1), 4);
		expect(delay.perTenPercent.crossoverPct).toBeCloseTo(0, 6);
	});

	it('predicts the exhaustive corners’ worst phase margin from the tolerance-weighted sum, to second order in the tolerances', () => {
		const base = { l: 0.03, c: 0.05, esr: 0.05, r2: 0.01, c1: 0.02, vramp: 0.03 };
		const gap = (k: number) => {
			const tolerances = Object.fromEntries(Object.entries(base).map(([n, t]) => [n, { tol: t * k }]));
			const doc = caseDoc('buck-bank-3v3', { tolerances });
			const r = report(doc);
			expect(r.rankedBy).toBe('tolerance');
			// Ranked: largest tolerance-weighted |ΔPM| first.
			const keys = r.rows.map((x) => Math.abs(x.atTolerance?.phaseMarginDeg ?? 0));
			expect([...keys].sort((a, b) => b - a)).toEqual(keys);
			const corners = runCorners(specOf(doc), { tolerances: Object.fromEntries(Object.entries(base).map(([n, t]) => [n, t * k])) });
			expect(corners.mode).toBe('exhaustive');
			const drop = r.nominal.phaseMarginDeg! - corners.worst.phaseMarginDeg!.value;
			return { drop, predicted: r.totals!.worst.phaseMarginDeg!, error: Math.abs(drop - r.totals!.worst.phaseMarginDeg!) };
		};
		const full = gap(1);
		const half = gap(0.5);
		// The 2^6 exact corners against the linearised sum: the first-order terms agree, so halving every
		// tolerance halves the drop and quarters the gap [common practice: Taylor expansion of a smooth figure].
		expect(half.drop / full.drop).toBeGreaterThan(0.4);
		expect(half.drop / full.drop).toBeLessThan(0.6);
		expect(half.error / full.error).toBeGreaterThan(0.15);
		expect(half.error / full.error).toBeLessThan(0.35);
		expect(half.error).toBeLessThan(0.15 * half.drop);
	});
});
