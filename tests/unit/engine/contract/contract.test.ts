import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeDesign } from '$lib/engine/analyze';
import { analysisResponseSchema, designDocumentSchema } from '$lib/engine/contract';
import { contractExample } from '../../support/contractExample';

const example = contractExample();

type Doc = typeof example & Record<string, unknown>;
const clone = (): Doc => structuredClone(example) as Doc;
function withChange(change: (d: Doc) => void): Doc {
	const d = clone();
	change(d);
	return d;
}
function fieldsOf(doc: unknown): Record<string, string> {
	const r = analyzeDesign(doc);
	if (!('error' in r)) throw new Error('expected an error');
	expect(r.error.code).toBe('invalid-design');
	return r.error.fields;
}

describe('design document schema', () => {
	it('accepts the contract example and fills defaults', () => {
		const d = designDocumentSchema.parse({ ...clone(), plant: { ...clone().plant, rdsOn: undefined } });
		expect(d.plant.rdsOn).toBe(0);
		const r = analyzeDesign(clone());
		expect('error' in r).toBe(false);
		expect(analysisResponseSchema.safeParse(r).success).toBe(true);
		if (!('error' in r)) {
			expect(r.response.freqHz.length).toBe(401);
			expect(r.response.freqHz[0]).toBe(10);
			expect(r.response.freqHz[400]).toBe(1e6);
			expect(r.response.loop.magDb.length).toBe(401);
		}
	});

	it('names each broken rule by field (contract rules)', () => {
		expect(fieldsOf(withChange((d) => (d.plant.inductor.l = 0)))).toEqual({ 'plant.inductor.l': 'must be > 0' });
		expect(fieldsOf(withChange((d) => (d.plant.inductor.l = -1e-6)))['plant.inductor.l']).toBe('must be > 0');
		expect(fieldsOf(withChange((d) => (d.plant.capacitors[0].c = 0)))['plant.capacitors.0.c']).toBe('must be > 0');
		expect(fieldsOf(withChange((d) => (d.plant.fsw = -5)))['plant.fsw']).toBe('must be > 0');
		expect(fieldsOf(withChange((d) => (d.plant.vout = 5)))['plant.vout']).toMatch(/< vin/);
		expect(fieldsOf(withChange((d) => ((d.plant.topology as string) = 'boost')))['plant.vout']).toMatch(/> vin/);
		expect(fieldsOf(withChange((d) => (d.sweep = { startHz: 1e6, stopHz: 10, points: 401 })))['sweep.startHz']).toMatch(/< stopHz/);
		expect(fieldsOf(withChange((d) => (d.sweep = { startHz: 1e6, stopHz: 1e6, points: 401 })))['sweep.startHz']).toMatch(/< stopHz/);
		expect(fieldsOf(withChange((d) => (d.sweep = { startHz: 10, stopHz: 1e6, points: 5001 })))['sweep.points']).toMatch(/≤ 5000/);
		expect(fieldsOf(withChange((d) => ((d.plant as Record<string, unknown>).iout = 'lots')))['plant.iout']).toMatch(/number/);
		expect(Object.keys(fieldsOf({}))).toEqual(expect.arrayContaining(['schemaVersion', 'plant', 'modulator', 'feedback', 'compensator']));
	});

	it('rejects a duty of 0.95 or more and a boost beyond its maximum gain, on plant.vout', () => {
		// buck 5 V → 4.9 V needs D ≥ 0.98 [docs/formulas.md §1.1]
		const f = fieldsOf(withChange((d) => (d.plant.vout = 4.9)));
		expect(f['plant.vout']).toMatch(/duty/);
		// boost 5 → 60 V with r = 0.1 Ω, R = 60 Ω: max V = ½·5·√600 ≈ 61 V, but D > 0.95 [docs/formulas.md §2.1]
		const g = fieldsOf(
			withChange((d) => {
				(d.plant.topology as string) = 'boost';
				d.plant.vout = 80;
				d.plant.iout = 1;
				d.plant.inductor.dcr = 0.1;
				d.feedback.vref = 1.25;
			})
		);
		expect(g['plant.vout']).toMatch(/maximum gain/);
	});

	it('the default sweep runs from two decades below f0 to fsw/2 with 400 points', () => {
		const d = clone();
		delete (d as Record<string, unknown>).sweep;
		const r = analyzeDesign(d);
		if ('error' in r) throw new Error(r.error.message);
		expect(r.response.freqHz.length).toBe(400);
		expect(r.response.freqHz[0]).toBeCloseTo(r.features.f0Hz / 100, 6);
		expect(r.response.freqHz[399]).toBeCloseTo(300e3, 6);
	});

	it('property: any numeric input gives a field error or a response with only finite numbers', () => {
		const docArb = fc.record({
			topology: fc.constantFrom('buck', 'boost'),
			vin: fc.double({ min: -2, max: 60, noNaN: true }),
			ratio: fc.double({ min: 0.05, max: 4, noNaN: true }),
			iout: fc.double({ min: 1e-3, max: 30, noNaN: true }),
			fsw: fc.double({ min: 1e4, max: 3e6, noNaN: true }),
			l: fc.double({ min: 1e-8, max: 1e-3, noNaN: true }),
			dcr: fc.double({ min: 0, max: 0.5, noNaN: true }),
			c: fc.double({ min: 1e-7, max: 1e-2, noNaN: true }),
			esr: fc.double({ min: 0, max: 0.2, noNaN: true }),
			esl: fc.double({ min: 0, max: 5e-9, noNaN: true }),
			count: fc.integer({ min: 1, max: 6 }),
			bulk: fc.boolean(),
			delay: fc.double({ min: 0, max: 2e-6, noNaN: true }),
			kind: fc.constantFrom('type2', 'type3'),
			fcRel: fc.double({ min: 0.02, max: 0.3, noNaN: true })
		});
		fc.assert(
			fc.property(docArb, (x) => {
				const doc = {
					schemaVersion: 1,
					plant: {
						topology: x.topology,
						vin: x.vin,
						vout: x.vin * x.ratio,
						iout: x.iout,
						fsw: x.fsw,
						inductor: { l: x.l, dcr: x.dcr },
						capacitors: [
							{ c: x.c, esr: x.esr, esl: x.esl, count: x.count },
							...(x.bulk ? [{ c: 10 * x.c, esr: 10 * x.esr + 0.01, esl: 0, count: 1 }] : [])
						]
					},
					modulator: { vramp: 1, feedForward: false, delay: x.delay },
					feedback: { vref: Math.min(0.6, Math.abs(x.vin * x.ratio)), r1: 10000 },
					compensator: { kind: x.kind, target: { method: 'k-factor', crossoverHz: x.fcRel * x.fsw, phaseMarginDeg: 50 } },
					sweep: { startHz: 10, stopHz: x.fsw / 2, points: 50 }
				};
				const r = analyzeDesign(doc);
				if ('error' in r) {
					expect(r.error.code, r.error.message).not.toBe('analysis-failed');
					expect(Object.keys(r.error.fields).length).toBeGreaterThan(0);
					return;
				}
				assertFinite(r, '');
				expect(analysisResponseSchema.safeParse(r).success).toBe(true);
			}),
			{ numRuns: 150 }
		);
	});
});

function assertFinite(x: unknown, path: string): void {
	if (typeof x === 'number') {
		if (!Number.isFinite(x)) throw new Error(`non-finite number at ${path}: ${x}`);
	} else if (Array.isArray(x)) x.forEach((v, i) => assertFinite(v, `${path}[${i}]`));
	else if (x && typeof x === 'object') for (const [k, v] of Object.entries(x)) assertFinite(v, `${path}.${k}`);
}
