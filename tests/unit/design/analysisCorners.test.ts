// The design screen's operating cases are analysed from the nominal's parsed document with only
// the plant, modulator and fixed network parsed again (analysis.ts validatedCorner). Every figure
// and trace must be what the whole-document path (analyzeDesignDetailed of the same case's
// document, the engine's public entry) gives: checked on a buck with two banks and on a boost.
import { describe, expect, it } from 'vitest';
import { analyzeForm } from '$lib/design/analysis';
import { demoForm, readForm, starterForm, type DesignForm } from '$lib/design/form';
import { analyzeDesignDetailed, operatingPointDocument, type DesignDocumentInput } from '$lib/engine';

function check(form: DesignForm) {
	const outcome = analyzeForm(readForm(form));
	if (!outcome.ok) throw new Error(outcome.message);
	const a = outcome.analysis;
	const c = a.nominal.response.compensator;
	const built = (c.rounded ?? c.ideal).parts;
	const parts: Record<string, number> = {};
	for (const [k, v] of Object.entries(built)) if (k !== 'r1' && k !== 'rb') parts[k] = v;
	const doc = a.nominal.document.compensator;
	const fixed = { kind: doc.kind, parts, series: null, ...(doc.opamp ? { opamp: doc.opamp } : {}) } as DesignDocumentInput['compensator'];
	expect(a.corners.length).toBeGreaterThan(1);
	for (const corner of a.corners) {
		if (corner.corner.nominal) continue;
		const whole = analyzeDesignDetailed(operatingPointDocument(a.document, corner.corner, fixed), { closedLoop: false, sections: false });
		if ('error' in whole) {
			expect(corner.error).toBe(whole.error.message);
			continue;
		}
		expect(corner.detail?.response).toEqual(whole.response);
	}
}

describe('analyzeForm operating cases', () => {
	it('match the whole-document analysis of each case (buck, two banks)', () => check(demoForm()));
	it('match the whole-document analysis of each case (boost)', () =>
		check(starterForm({ name: '5V0_SENSOR', topology: 'boost', vout: 5, vinNom: 3.7, vinMin: 3, vinMax: 4.2, ioutNom: 0.3, ioutMin: 0.03, ioutMax: 0.45, fsw: 1e6 } as Parameters<typeof starterForm>[0])));
});
