import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fitDesign, fittedDocument, FIT_MAX_PARAMETERS, type FitResult } from '$lib/engine/fit';
import { designDocumentSchema } from '$lib/engine/contract/designSchema';
import { analyzeDesign } from '$lib/engine/analyze';

const ref = JSON.parse(readFileSync('reference/fit/out/cases.json', 'utf8')) as {
	design: Record<string, unknown>;
	cases: { measurement: { freqHz: number[]; magDb: number[]; phaseDeg: number[] } }[];
};
const measurement = ref.cases[0].measurement;
const run = (request: unknown, document: unknown = ref.design) => fitDesign({ document, measurement, request, measuredKind: 'loop' });
const fieldsOf = (r: ReturnType<typeof run>) => ('error' in r ? r.error.fields : {});

describe('fit request rules', () => {
	it('names the field and the rule for a bad request', () => {
		expect(fieldsOf(run({ parameters: [] }))).toEqual({ parameters: 'mark at least one parameter as uncertain' });
		expect(fieldsOf(run({ parameters: [{ name: 'q' }] }))['parameters.0.name']).toMatch(/must be one of/);
		expect(fieldsOf(run({ parameters: [{ name: 'esr', branch: 5 }] }))['parameters.0.branch']).toMatch(/2 branches/);
		expect(fieldsOf(run({ parameters: [{ name: 'l' }, { name: 'l' }] })).parameters).toMatch(/at most once/);
		expect(fieldsOf(run({ parameters: Array.from({ length: FIT_MAX_PARAMETERS + 1 }, () => ({ name: 'l' })) })).parameters).toMatch(/at most 12/);
		expect(fieldsOf(run({ parameters: [{ name: 'l' }], maxIterations: 10_000 })).maxIterations).toMatch(/≤ 200/);
		expect(fieldsOf(run({ parameters: [{ name: 'l', min: 2, max: 3 }] }))['parameters.0.min']).toMatch(/contain the typed value/);
	});

	it('refuses what the measurement or the design cannot support, saying why', () => {
		expect(fieldsOf(run({ parameters: [{ name: 'vramp' }], response: 'plant' }))['parameters.0.name']).toMatch(/does not depend on the modulator/);
		const noEsl = structuredClone(ref.design) as { plant: { capacitors: { esl: number }[] } };
		noEsl.plant.capacitors[0].esl = 0;
		expect(fieldsOf(run({ parameters: [{ name: 'esl', branch: 0 }] }, noEsl))['parameters.0.name']).toMatch(/is 0 in the design/);
		expect(fieldsOf(run({ parameters: [{ name: 'l' }], startHz: 1000, stopHz: 1200 })).startHz).toMatch(/needs at least 10/);
		const r = run({ parameters: [{ name: 'l' }] }, { ...ref.design, plant: 'x' });
		expect('error' in r && r.error.code).toBe('invalid-design');
	});

	it('writes the fitted values back so the document analyses with them', () => {
		const r = run({ parameters: [{ name: 'c', branch: 0 }, { name: 'vramp' }, { name: 'delay' }] }) as FitResult;
		expect('error' in r).toBe(false);
		const doc = designDocumentSchema.parse(ref.design);
		const out = fittedDocument(doc, r);
		expect(out.plant.capacitors[0].c).toBe(r.parameters[0].fitted);
		expect(out.modulator.vramp).toBe(r.parameters[1].fitted);
		expect(out.modulator.delay).toBe(r.parameters[2].fitted);
		expect(doc.modulator.delay).toBe(0);
		const a = analyzeDesign(out, { includeResponse: false });
		expect('error' in a).toBe(false);
	});

	it('keeps a derated branch derated: the fitted effective value comes back after derating', () => {
		const doc = designDocumentSchema.parse({
			...ref.design,
			plant: { ...(ref.design.plant as object), capacitors: [{ c: 22e-6, esr: 0.004, esl: 4e-10, count: 3, dcBias: { v0: 4, k: 1.6 }, ageing: 0.05 }, (ref.design.plant as { capacitors: unknown[] }).capacitors[1]] }
		});
		const r = fitDesign({ document: doc, measurement, request: { parameters: [{ name: 'c', branch: 0 }] }, measuredKind: 'loop' }) as FitResult;
		const out = fittedDocument(doc, r);
		const again = fitDesign({ document: out, measurement, request: { parameters: [{ name: 'c', branch: 0 }] }, measuredKind: 'loop' }) as FitResult;
		// The next analysis starts from the fitted effective value.
		expect(again.parameters[0].typed / r.parameters[0].fitted).toBeCloseTo(1, 9);
	});
});
