// The design form's inputs for light load, loss part data, the RDS(on) coefficient, the
// temperature range and a capacitor's DC-bias point or curve: typed text → document → form
// → document loses nothing, and a bad entry names its field and rule.
import { describe, expect, it } from 'vitest';
import { designDocumentSchema } from '$lib/engine';
import { demoForm, formFromDocument, readForm } from '$lib/design/form';

/** A demo document carrying every optional plant input the form offers. */
function fullDocument() {
	const r = readForm(demoForm());
	expect(r.errors).toEqual({});
	const doc = structuredClone(r.document!);
	doc.plant.capacitors[0] = { ...doc.plant.capacitors[0], tempClass: 'X5R', dcBias: { v0: 6.3, k: 1.8 }, ageing: 0.025 };
	doc.plant.capacitors[1] = { ...doc.plant.capacitors[1], dcBias: { points: [{ v: 1.2, c: 300e-6 }, { v: 2.5, c: 250e-6 }] } };
	doc.plant.lightLoad = 'diode-emulation';
	doc.plant.rdsOnTempco = 0.004;
	doc.plant.losses = { riseTime: 12e-9, fallTime: 9e-9, coss: 450e-12, qrr: 25e-9, deadTime: 18e-9, bodyDiodeVf: 0.75, qg: 9.2e-9, gateDrive: 5, coreLoss: 0.12 };
	doc.corners = { ...doc.corners, temperature: { min: -40, max: 105 } };
	return doc;
}

describe('plant inputs on the design form', () => {
	it('a document with a DC-bias curve, extra bias points, light load, losses, tempco and temperature reopens and reads back unchanged', () => {
		const doc = fullDocument();
		expect(designDocumentSchema.safeParse(doc).success).toBe(true);
		const form = formFromDocument(doc as never, null);
		// The curve reopens as the curve (its V0 and k), not as a point.
		expect(form.capacitors[0]).toMatchObject({ biasKind: 'curve', biasV0: '6.3V', biasK: '1.8', tempClass: 'X5R', ageing: '2.5' });
		expect(form.capacitors[1]).toMatchObject({ biasKind: 'point', biasV: '1.2V', biasC: '300µF', biasMorePoints: [{ v: 2.5, c: 250e-6 }] });
		expect(form).toMatchObject({ lightLoad: 'diode-emulation', rdsOnTempco: '0.4', tempMin: '-40', tempMax: '105' });
		const back = readForm(form);
		expect(back.errors).toEqual({});
		const d = back.document!;
		expect(d.plant.capacitors[0].dcBias).toEqual({ v0: 6.3, k: 1.8 });
		expect(d.plant.capacitors[1].dcBias).toEqual({ points: [{ v: 1.2, c: 300e-6 }, { v: 2.5, c: 250e-6 }] });
		expect(d.plant.capacitors[0].ageing).toBeCloseTo(0.025, 12);
		expect(d.plant.lightLoad).toBe('diode-emulation');
		expect(d.plant.rdsOnTempco).toBeCloseTo(0.004, 12);
		expect(d.corners!.temperature).toEqual({ min: -40, max: 105 });
		for (const [k, v] of Object.entries(doc.plant.losses!)) expect((d.plant.losses as Record<string, number>)[k], k).toBeCloseTo(v, 18);
		expect(designDocumentSchema.safeParse(d).success).toBe(true);
	});

	it('blank optional inputs leave the document as before (no lightLoad, losses, tempco or temperature)', () => {
		const d = readForm(demoForm()).document!;
		expect(d.plant.lightLoad).toBeUndefined();
		expect(d.plant.losses).toBeUndefined();
		expect(d.plant.rdsOnTempco).toBeUndefined();
		expect(d.corners!.temperature).toBeUndefined();
	});

	it('engineering notation with units: 15n s, 2n2 C, 0.8 V', () => {
		const d = readForm({ ...demoForm(), lightLoad: 'diode', losses: { riseTime: '15ns', qg: '2n2', diodeVf: '0.8V' } }).document!;
		expect(d.plant.losses!.riseTime).toBeCloseTo(15e-9, 20);
		expect(d.plant.losses!.qg).toBeCloseTo(2.2e-9, 20);
		expect(d.plant.losses!.diodeVf).toBe(0.8);
	});

	it('a bad entry names its field and the rule', () => {
		const r = readForm({ ...demoForm(), losses: { qg: '1m', coss: 'lots' }, tempMin: '-40', rdsOnTempco: '-1' });
		// The contract's limits: qg ≤ 10 µC, tempco ≥ 0; one end of a range needs the other.
		expect(r.errors['losses.qg']).toMatch(/must be ≤ 10 µC/);
		expect(r.errors['losses.coss']).toBeTruthy();
		expect(r.errors.tempMax).toMatch(/needs a value/);
		expect(r.errors.rdsOnTempco).toMatch(/≥ 0/);
		expect(r.document).toBeNull();
		const swapped = readForm({ ...demoForm(), tempMin: '85', tempMax: '-20' });
		expect(swapped.errors.tempMin).toMatch(/≤ T max/);
		const curve = demoForm();
		Object.assign(curve.capacitors[0], { biasKind: 'curve', biasV0: '6.3' });
		expect(readForm(curve).errors['capacitors.0.biasK']).toMatch(/exponent/);
	});
});
