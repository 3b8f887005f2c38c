/**
 * The design form's control method: peak current mode writes senseGain and rampSlope (SI, from
 * engineering notation with their units) instead of the ramp, reads back losslessly, and a bad
 * value comes back at its field.
 */
import { describe, expect, it } from 'vitest';
import { demoForm, fieldForPath, formFromDocument, readForm, type DesignForm } from '$lib/design/form';
import { analyzeDesign } from '$lib/engine';

/** The document a form reads into; a form with errors fails the test with them. */
function documentOf(f: DesignForm) {
	const r = readForm(f);
	if (!r.document) throw new Error(`form errors: ${JSON.stringify(r.errors)}`);
	return r.document;
}

describe('design form: control method', () => {
	const form = { ...demoForm(), control: 'peak-current' as const, senseGain: '50m V/A', rampSlope: '120k' };

	it('peak current mode: the document carries control, Ri and Se in SI and no ramp', () => {
		expect(readForm(form).errors).toEqual({});
		const doc = documentOf(form);
		expect(doc.modulator).toEqual({ control: 'peak-current', senseGain: 0.05, rampSlope: 120e3, delay: 0 });
		const a = analyzeDesign(doc);
		if ('error' in a) throw new Error(JSON.stringify(a.error));
		expect(a.features.currentMode?.se).toBe(120e3);
	});

	it('document → form → document is lossless', () => {
		const doc = documentOf(form);
		const again = documentOf(formFromDocument(doc as never, null));
		expect(again.modulator).toEqual(doc.modulator);
	});

	it('a slope typed in the wrong unit is refused at its field; engine field paths map back', () => {
		const r = readForm({ ...form, rampSlope: '5 A' });
		expect(r.errors.rampSlope).toBeTruthy();
		expect(fieldForPath('modulator.senseGain')).toBe('senseGain');
		expect(fieldForPath('modulator.rampSlope')).toBe('rampSlope');
	});

	it('voltage mode is unchanged: the ramp and feed-forward, no current-mode fields', () => {
		expect(documentOf(demoForm()).modulator).toEqual({ vramp: 1, feedForward: false, delay: 0 });
	});
});
