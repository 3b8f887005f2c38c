// The robustness sections of the contract: the analysis response carries closedLoop (and
// corners, inputFilter, spread when the document asks), validates against the response schema,
// agrees with the outside references through the contract, and bad sections name their field.
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '$lib/engine/analyze';
import { analysisResponseSchema, type AnalysisResponse } from '$lib/engine/contract';
import { INLINE_SPREAD_MAX } from '$lib/engine/closedloop/sections';
import { caseDoc, closedRef } from '../closedloop/helpers';
import { contractExample } from '../../support/contractExample';

const example = contractExample;

function ok(doc: unknown, options?: Parameters<typeof analyzeDesign>[1]): AnalysisResponse {
	const r = analyzeDesign(doc, options);
	if ('error' in r) throw new Error(JSON.stringify(r.error));
	const parsed = analysisResponseSchema.safeParse(r);
	if (!parsed.success) throw new Error(JSON.stringify(parsed.error.issues.slice(0, 3)));
	return r;
}
function fieldsOf(doc: unknown): Record<string, string> {
	const r = analyzeDesign(doc);
	if (!('error' in r)) throw new Error('expected an error');
	expect(r.error.code).toBe('invalid-design');
	return r.error.fields;
}
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const atHz = (freqHz: number[], f: number) => freqHz.findIndex((x) => x >= f);

describe('closedLoop section in the analysis response', () => {
	const r = ok(example());
	const cl = r.closedLoop!;

	it('is present with the response, on the sweep grid, and agrees with the metrics on stability', () => {
		expect(cl).toBeDefined();
		expect(cl.responses.freqHz).toEqual(r.response.freqHz);
		expect(cl.responses.outputImpedanceClosed.magDb.length).toBe(401);
		expect(cl.stable).toBe(r.metrics.closedLoopStable);
	});

	it('open-loop |Zo| at 10 Hz is the series resistance DCR + RDS(on) = 10 mΩ', () => {
		// [published: Erickson & Maksimović 2nd ed. §8.1 — buck output impedance at DC = r_L ∥ R ≈ r_L]
		const rL = 0.004 + 0.006;
		const dc = 20 * Math.log10((rL * 0.15) / (rL + 0.15)); // r_L ∥ R, R = 1.2 V / 8 A
		expect(cl.responses.outputImpedanceOpen.magDb[0]).toBeCloseTo(dc, 1);
		// Feedback lowers it by the loop gain at low frequency [common practice: Zo,cl = Zo/(1 + T)].
		const i = atHz(r.response.freqHz, 100);
		const lowered = cl.responses.outputImpedanceOpen.magDb[i] - cl.responses.outputImpedanceClosed.magDb[i];
		expect(lowered).toBeGreaterThan(20);
		expect(Math.abs(lowered - r.response.loop.magDb[i])).toBeLessThan(0.5);
	});

	it('reference-to-output is 1/H = Vout/Vref at low frequency, and S + T/(1+T) = 1 at every frequency', () => {
		// [common practice: the divider sets the DC gain from the reference, 1.2/0.6 = 2 = 6.02 dB]
		expect(cl.responses.referenceToOutput.magDb[0]).toBeCloseTo(20 * Math.log10(2), 2);
		// [from memory: 1/(1+T) + T/(1+T) = 1 identically]
		const s = cl.responses.sensitivity;
		const t = cl.responses.complementarySensitivity;
		for (let i = 0; i < s.magDb.length; i += 20) {
			const a = 10 ** (s.magDb[i] / 20);
			const b = 10 ** (t.magDb[i] / 20);
			const pa = (s.phaseDeg[i] * Math.PI) / 180;
			const pb = (t.phaseDeg[i] * Math.PI) / 180;
			// The traces are rounded to 1e-4 dB and 1e-4° for display (1.2e-5 and 1.7e-6 relative).
			expect(Math.hypot(a * Math.cos(pa) + b * Math.cos(pb), a * Math.sin(pa) + b * Math.sin(pb))).toBeCloseTo(1, 4);
		}
	});

	it('load step: default ΔI = 0.5·Iout, recovers to zero (integral action), rule of thumb beside it', () => {
		const ls = cl.loadStep!;
		expect(ls.step).toBe(4);
		// [common practice: an integrator in the loop removes the static error of a load step]
		expect(Math.abs(ls.figures.finalValue)).toBeLessThan(1e-9);
		expect(ls.figures.peakDeviation).toBeLessThan(0);
		expect(ls.waveform.timeS.length).toBeLessThanOrEqual(600);
		// ΔV ≈ ΔI/(2π·fc·C) [common practice], computed from the response's own fc and the 141 µF bank.
		const expectV = 4 / (2 * Math.PI * r.metrics.crossoverHz! * 141e-6);
		expect(rel(ls.ruleOfThumb!.capacitiveV, expectV)).toBeLessThan(1e-9);
		// Reference step: 1 % of Vref, final value ΔVref/H.
		const rs = cl.referenceStep!;
		expect(rs.step).toBeCloseTo(0.006, 12);
		expect(rs.figures.finalValue).toBeCloseTo(0.012, 9);
	});
});

describe('closedLoop section against ngspice and scipy, through the contract', () => {
	for (const name of ['buck-ceramic-1v2', 'boost-bank-12v-24v']) {
		it(`${name}: load-step peak and settling within 2 % of ngspice, reference step within 0.5 % of scipy`, () => {
			const ref = closedRef(name);
			const doc = {
				...caseDoc(name),
				loadStep: { step: ref.ngspice.step, riseTime: ref.ngspice.riseTime, referenceStep: ref.scipy.referenceStep.step }
			};
			const cl = ok(doc, { includeResponse: false }).closedLoop!;
			// [ngspice-39 transient of the averaged closed-loop netlist, reference/closedloop/netlists]
			expect(rel(cl.loadStep!.figures.peakDeviation, ref.ngspice.peakDeviation)).toBeLessThan(0.02);
			expect(rel(cl.loadStep!.figures.settlingTimeS!, ref.ngspice.settlingTimeS)).toBeLessThan(0.02);
			// [scipy.signal.step of the closed-loop reference-to-output, reference/closedloop/generate.py]
			expect(rel(cl.referenceStep!.figures.peakDeviation, ref.scipy.referenceStep.peakDeviation)).toBeLessThan(5e-3);
		});
	}
});

describe('which sections are computed', () => {
	it('includeResponse: false leaves closedLoop out unless the document has loadStep', () => {
		expect(ok(example(), { includeResponse: false }).closedLoop).toBeUndefined();
		expect(ok({ ...example(), loadStep: { step: 1 } }, { includeResponse: false }).closedLoop?.loadStep?.step).toBe(1);
		expect(ok(example(), { closedLoop: false }).closedLoop).toBeUndefined();
	});

	it('corners: 3 Vin × 2 Iout × 2² tolerance signs + the nominal, worst PM is the smallest of all', () => {
		const r = ok({
			...example(),
			tolerances: { l: { tol: 0.2 }, c: { tol: 0.1 } },
			corners: { vin: { min: 4.5, max: 5.5 }, iout: { min: 1, max: 8 } }
		});
		const c = r.corners!;
		// [from memory: full factorial count 3·2·2² = 24, plus the nominal]
		expect(c.mode).toBe('exhaustive');
		expect(c.corners.length).toBe(25);
		const pms = c.corners.map((x) => x.phaseMarginDeg).filter((x): x is number => x !== null);
		expect(c.worst.phaseMarginDeg!.value).toBe(Math.min(...pms));
		expect(c.worst.phaseMarginDeg!.value).toBeLessThanOrEqual(r.metrics.phaseMarginDeg!);
		expect(c.traces[0].label).toBe('nominal');
		expect(c.traces[0].magDb.length).toBe(401);
	});

	it('inputFilter: optimum damping for n = 4 is Qopt = 0.61237 (Erickson), verdict given', () => {
		const r = ok({ ...example(), inputFilter: { l: 1e-6, c: 10e-6, damping: { optimalRatio: 4 } } });
		const f = r.inputFilter!;
		// [published: Erickson, "Optimal Single Resistor Damping of Input Filters", APEC 1999]
		const n4 = f.optimal.find((o) => o.n === 4)!;
		expect(n4.qOpt).toBeCloseTo(0.61237, 5);
		expect(f.damping!.rd).toBeCloseTo(0.61237 * Math.sqrt(0.1), 5);
		expect(['pass', 'marginal', 'fail']).toContain(f.verdict.code);
		expect(f.impedances.zsDb.length).toBe(401);
	});

	it('spread: small runs inline and reproduce with the seed; large runs are left to reports', () => {
		const doc = { ...example(), tolerances: { l: { tol: 0.2 }, c: { tol: 0.2, dist: 'normal' } }, spread: { samples: 200, seed: 7 } };
		const a = ok(doc, { includeResponse: false }).spread!;
		const b = ok(doc, { includeResponse: false }).spread!;
		expect(a.completed).toBe(200);
		expect(a.stats).toEqual(b.stats);
		expect(a.yield.all).toBeGreaterThanOrEqual(0);
		expect(a.yield.all).toBeLessThanOrEqual(1);
		// Histogram counts add up to the samples with the metric [from memory].
		expect(a.histograms.phaseMarginDeg.counts.reduce((s, x) => s + x, 0) + a.histograms.phaseMarginDeg.missing).toBe(200);
		const big = analyzeDesign({ ...doc, spread: { samples: INLINE_SPREAD_MAX + 1 } }, { includeResponse: false });
		if ('error' in big) throw new Error('unexpected error');
		expect(big.spread).toBeUndefined();
		expect(big.warnings.map((w) => w.code)).toContain('spread-not-inline');
	});
});

describe('invalid sections give field-named errors', () => {
	const cases: [string, Record<string, unknown>, string, string][] = [
		['loadStep rise time', { loadStep: { riseTime: -1e-6 } }, 'loadStep.riseTime', 'must be ≥ 0'],
		['loadStep zero step', { loadStep: { step: 0 } }, 'loadStep.step', 'must be a finite number ≠ 0'],
		['tolerance too wide', { tolerances: { l: { tol: 2 } } }, 'tolerances.l.tol', 'must be ≤ 0.9 (±90 %)'],
		['tolerance distribution', { tolerances: { c: { tol: 0.1, dist: 'triangle' } } }, 'tolerances.c.dist', 'must be "uniform" or "normal"'],
		['corner range', { corners: { vin: { min: 6, max: 4 } } }, 'corners.vin.min', 'min must be ≤ max'],
		['spread samples', { spread: { samples: 200000 } }, 'spread.samples', 'must be ≤ 10000'],
		['spread seed', { spread: { seed: 1.5 } }, 'spread.seed', 'must be a whole number'],
		['filter inductance', { inputFilter: { l: 0, c: 1e-5 } }, 'inputFilter.l', 'must be > 0'],
		['filter margin', { inputFilter: { l: 1e-6, c: 1e-5, marginDb: -1 } }, 'inputFilter.marginDb', 'must be ≥ 0 dB']
	];
	for (const [what, section, path, message] of cases) {
		it(what, () => {
			expect(fieldsOf({ ...example(), ...section })).toEqual({ [path]: message });
		});
	}
	it('an unknown part name in tolerances is named', () => {
		const f = fieldsOf({ ...example(), tolerances: { q9: { tol: 0.1 } } });
		expect(Object.keys(f)[0]).toMatch(/^tolerances/);
	});
});

describe('property: every section holds only finite numbers', () => {
	it('random buck and boost designs with every section', async () => {
		const fc = (await import('fast-check')).default;
		const arb = fc.record({
			boost: fc.boolean(),
			vin: fc.double({ min: 3, max: 48, noNaN: true }),
			ratio: fc.double({ min: 0.1, max: 0.8, noNaN: true }),
			l: fc.double({ min: 1e-7, max: 1e-4, noNaN: true }),
			c: fc.double({ min: 1e-6, max: 1e-3, noNaN: true }),
			esr: fc.double({ min: 0, max: 0.1, noNaN: true }),
			dcr: fc.double({ min: 0, max: 0.05, noNaN: true }),
			fcRel: fc.double({ min: 0.02, max: 0.25, noNaN: true }),
			lf: fc.double({ min: 1e-7, max: 1e-4, noNaN: true }),
			rd: fc.double({ min: 1e-3, max: 10, noNaN: true })
		});
		fc.assert(
			fc.property(arb, (x) => {
				const vout = x.boost ? x.vin / x.ratio : x.vin * x.ratio;
				const doc = {
					schemaVersion: 1,
					plant: { topology: x.boost ? 'boost' : 'buck', vin: x.vin, vout, iout: 2, fsw: 500e3, inductor: { l: x.l, dcr: x.dcr }, capacitors: [{ c: x.c, esr: x.esr }] },
					modulator: { vramp: 1 },
					feedback: { vref: Math.min(0.8, vout), r1: 10000 },
					compensator: { kind: 'type3', target: { method: 'k-factor', crossoverHz: x.fcRel * 500e3, phaseMarginDeg: 50 } },
					sweep: { startHz: 10, stopHz: 250e3, points: 60 },
					loadStep: { step: 1 },
					tolerances: { l: { tol: 0.2 }, esr: { tol: 0.5 } },
					corners: { iout: { min: 0.5, max: 2 } },
					inputFilter: { l: x.lf, c: 10e-6, damping: { rd: x.rd, cd: 40e-6 } }
				};
				const r = analyzeDesign(doc);
				if ('error' in r) {
					expect(r.error.code, r.error.message).not.toBe('analysis-failed');
					return;
				}
				const parsed = analysisResponseSchema.safeParse(r);
				expect(parsed.success, parsed.success ? '' : JSON.stringify(parsed.error.issues.slice(0, 2))).toBe(true);
			}),
			{ numRuns: 25 }
		);
	});
});
