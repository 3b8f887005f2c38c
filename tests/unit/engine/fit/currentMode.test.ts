import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fitDesign, type FitResult } from '$lib/engine/fit';
import { designSensitivity, type SensitivityReport } from '$lib/engine/sensitivity';
import { designDocumentSchema, type DesignDocumentInput } from '$lib/engine/contract/designSchema';
import { analyzeValidatedDesign, type AnalysisDetail } from '$lib/engine/analyze';

// reference/currentmode: peak current-mode designs and their loop gain measured by sine injection
// on a cycle-by-cycle switching simulation (numpy/scipy, no averaged model). Here the simulated
// circuit is the truth and the typed design is deliberately off in one parameter.
type Doc = DesignDocumentInput & { plant: { capacitors: { esr: number }[] }; modulator: { senseGain: number; rampSlope: number } };
const caseDoc = (name: string): Doc => JSON.parse(readFileSync(`reference/currentmode/cases/${name}.json`, 'utf8'));
function simulated(name: string) {
	const out = JSON.parse(readFileSync(`reference/currentmode/out/${name}.json`, 'utf8')) as { points: { freqHz: number; magDb: number; phaseDeg: number }[] };
	return { freqHz: out.points.map((p) => p.freqHz), magDb: out.points.map((p) => p.magDb), phaseDeg: out.points.map((p) => p.phaseDeg) };
}
// Up to fsw/5, where the model follows the simulation within 0.26 dB / 0.9° (reference/currentmode/README.md).
const fit = (name: string, typed: Doc, parameters: object[]) => {
	const r = fitDesign({ document: typed, measurement: simulated(name), request: { parameters, stopHz: typed.plant.fsw / 5 }, measuredKind: 'loop' });
	if ('error' in r) throw new Error(r.error.message);
	return r as FitResult;
};

describe('fit on a peak current-mode design, against a switching simulation', () => {
	for (const name of ['buck-d028-mc13', 'buck-d066-mc17', 'boost-d058-rhp']) {
		it(`${name}: a sense gain typed 40 % high is fitted back to the simulated circuit's Ri`, () => {
			const truth = caseDoc(name);
			const typed = structuredClone(truth);
			typed.modulator.senseGain *= 1.4;
			const r = fit(name, typed, [{ name: 'senseGain' }]);
			const p = r.parameters[0];
			expect(p.label).toBe('Ri');
			expect(p.typed).toBeCloseTo(1.4 * truth.modulator.senseGain, 12);
			// Within 2 % of the circuit's Ri [published: reference/currentmode switching simulation, 0.26 dB model agreement to fsw/5].
			expect(Math.abs(p.fitted / truth.modulator.senseGain - 1)).toBeLessThan(0.02);
			expect(p.interval).not.toBeNull();
			// The 40 % error shows as ≈ 20·log10(1.4) = 2.9 dB of gain before the fit and is gone after it.
			expect(r.residual.before.rmsDb).toBeGreaterThan(2.5);
			expect(r.residual.after.rmsDb).toBeLessThan(0.3);
		});
	}

	it('a compensation ramp typed at twice the circuit’s is fitted back within 10 %, an ESR typed double within 5 %', () => {
		const name = 'buck-polymer-fc-fsw10';
		const truth = caseDoc(name);
		const rampOff = structuredClone(truth);
		rampOff.modulator.rampSlope *= 2;
		const se = fit(name, rampOff, [{ name: 'rampSlope' }]).parameters[0];
		// [published: reference/currentmode switching simulation; Se only moves the fsw/2 pair's damping, so it is the looser estimate]
		expect(Math.abs(se.fitted / truth.modulator.rampSlope - 1)).toBeLessThan(0.1);
		const esrOff = structuredClone(truth);
		esrOff.plant.capacitors[0].esr *= 2;
		const esr = fit(name, esrOff, [{ name: 'esr', branch: 0 }]).parameters[0];
		// [published: reference/currentmode switching simulation; the polymer's ESR zero sits near fc]
		expect(Math.abs(esr.fitted / truth.plant.capacitors[0].esr - 1)).toBeLessThan(0.05);
	});

	it('names the parameter that explains the deviation when several are ticked and only Ri was typed wrong', () => {
		const name = 'buck-polymer-fc-fsw10';
		const truth = caseDoc(name);
		const typed = structuredClone(truth);
		typed.modulator.senseGain *= 1.4;
		const r = fit(name, typed, [{ name: 'esr', branch: 0 }, { name: 'senseGain' }, { name: 'l' }]);
		// [published: reference/currentmode switching simulation, whose Ri is the case's]
		expect(r.explainedBy).toBe(1);
		const ri = r.parameters[1];
		expect(ri.interval!.low).toBeGreaterThan(truth.modulator.senseGain * 0.97);
		expect(ri.interval!.high).toBeLessThan(truth.modulator.senseGain * 1.03);
		// Put back at the typed value, Ri leaves the 40 % gain error: ≈ 20·log10(1.4) = 2.9 dB rms.
		expect(ri.residualIfTyped.rmsDb).toBeGreaterThan(2.5);
		expect(r.parameters[0].residualIfTyped.rmsDb).toBeLessThan(ri.residualIfTyped.rmsDb);
	});

	it('refuses the PWM ramp in current mode and Ri in voltage mode, naming the field', () => {
		const doc = caseDoc('buck-d028-mc13');
		const r = fitDesign({ document: doc, measurement: simulated('buck-d028-mc13'), request: { parameters: [{ name: 'vramp' }] }, measuredKind: 'loop' });
		expect('error' in r && r.error.fields['parameters.0.name']).toMatch(/no PWM ramp/);
		const voltage = JSON.parse(readFileSync('reference/cases/buck-bank-3v3.json', 'utf8'));
		const v = fitDesign({ document: voltage, measurement: simulated('buck-d028-mc13'), request: { parameters: [{ name: 'senseGain' }] }, measuredKind: 'loop' });
		expect('error' in v && v.error.fields['parameters.0.name']).toMatch(/only in peak current mode/);
	});
});

describe('sensitivity of a peak current-mode design', () => {
	const metrics = (doc: Doc) => {
		const d = analyzeValidatedDesign(designDocumentSchema.parse(doc)) as AnalysisDetail;
		return d.response.metrics;
	};

	for (const name of ['buck-d028-mc13', 'buck-d066-mc17']) {
		it(`${name}: Ri and Se have rows, the unused PWM ramp none, and both agree with ±1 % differences of the whole analysis`, () => {
			const doc = caseDoc(name);
			const r = designSensitivity(designDocumentSchema.parse(doc)) as SensitivityReport;
			const names = r.rows.map((x) => x.parameter);
			expect(names).toContain('senseGain');
			expect(names).toContain('rampSlope');
			expect(names).not.toContain('vramp');
			for (const parameter of ['senseGain', 'rampSlope'] as const) {
				const row = r.rows.find((x) => x.parameter === parameter)!;
				const at = (k: number) => {
					const d = structuredClone(doc);
					d.modulator[parameter] *= k;
					return metrics(d);
				};
				const up = at(1.01);
				const down = at(1 / 1.01);
				// Secant of the re-analysed document over ±1 %, stated per +10 % (× ln 1.1 / ln 1.01)
				// [common practice: central difference of a smooth figure; ±10 % bends with the fsw/2 peak at Qp 4.4].
				const per10 = Math.log(1.1) / (2 * Math.log(1.01));
				const pm = (up.phaseMarginDeg! - down.phaseMarginDeg!) * per10;
				const gm = (up.gainMarginDb! - down.gainMarginDb!) * per10;
				expect(Math.abs(row.perTenPercent.phaseMarginDeg! - pm)).toBeLessThan(0.01 * Math.abs(pm) + 0.005);
				expect(Math.abs(row.perTenPercent.gainMarginDb! - gm)).toBeLessThan(0.01 * Math.abs(gm) + 0.005);
			}
		});
	}

	it('where they matter: Ri moves PM most of all parts at D = 0.28, Se is among the two largest GM movers at D = 0.67', () => {
		const low = designSensitivity(designDocumentSchema.parse(caseDoc('buck-d028-mc13'))) as SensitivityReport;
		const byPm = [...low.rows].sort((a, b) => Math.abs(b.perTenPercent.phaseMarginDeg!) - Math.abs(a.perTenPercent.phaseMarginDeg!));
		expect(byPm[0].parameter).toBe('senseGain');
		// Near mc·D′ = 0.5 the ramp sets the damping of the fsw/2 pair, hence the gain margin
		// [published: Ridley 1991, Qp = 1/(π(mc·D′ − 0.5)), from memory].
		const high = designSensitivity(designDocumentSchema.parse(caseDoc('buck-d066-mc17'))) as SensitivityReport;
		const byGm = [...high.rows].sort((a, b) => Math.abs(b.perTenPercent.gainMarginDb!) - Math.abs(a.perTenPercent.gainMarginDb!));
		expect(byGm.slice(0, 2).map((x) => x.parameter)).toContain('rampSlope');
	});

	it('without a ramp, the loop gain scales as 1/Ri: GM rises 20·log10(1.1) dB per +10 % of Ri', () => {
		const doc = caseDoc('buck-d028-mc13');
		doc.modulator.rampSlope = 0;
		const r = designSensitivity(designDocumentSchema.parse(doc)) as SensitivityReport;
		expect(r.rows.map((x) => x.parameter)).not.toContain('rampSlope');
		const ri = r.rows.find((x) => x.parameter === 'senseGain')!;
		// With Se = 0, Fm = 1/(Sn·Ts) ∝ 1/Ri while Fm·Ri and Fm·kr do not depend on Ri, so Gvc ∝ 1/Ri
		// [published: Ridley 1991 modulator gains, from memory; docs/formulas.md §14].
		expect(ri.perTenPercent.gainMarginDb).toBeCloseTo(20 * Math.log10(1.1), 4);
	});
});
