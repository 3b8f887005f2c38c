// The words for status codes and the one date format (raw `in-review` and three date forms).
import { describe, expect, it } from 'vitest';
import { formatDateTime } from '$lib/text/dates';
import { loopStatusText, requestStatusText } from '$lib/text/status';
import { apiErrorText } from '$lib/text/errors';
import { importDesignJson, importFailure } from '$lib/server/exports/designJson';

describe('status words', () => {
	it('no code reaches the screen with its hyphen', () => {
		expect(loopStatusText('in-review')).toBe('in review');
		expect(loopStatusText('changes-requested')).toBe('changes requested');
		expect(requestStatusText('changes-requested')).toBe('changes requested');
		expect(loopStatusText(null)).toBe('–');
		expect(loopStatusText('some-new-state')).toBe('some new state');
	});
});

describe('formatDateTime', () => {
	it('one form in UTC whatever the input type [common practice: ISO 8601 instant]', () => {
		const iso = '2026-12-02T15:51:30.000Z';
		expect(formatDateTime(iso)).toBe('2 Dec 2026, 15:51 UTC');
		expect(formatDateTime(new Date(iso))).toBe('2 Dec 2026, 15:51 UTC');
		expect(formatDateTime(Date.parse(iso))).toBe('2 Dec 2026, 15:51 UTC');
		expect(formatDateTime('not a date')).toBe('–');
		expect(formatDateTime(null)).toBe('–');
	});
});

describe('an import error reads once ("(document.(document): is not valid JSON…" doubled)', () => {
	it('the API answer and the sentence shown name the JSON problem once', () => {
		const r = importDesignJson('{ not json');
		if (r.ok) throw new Error('parsed');
		const answer = importFailure(r.error);
		expect(Object.keys(answer.fields)).toEqual(['document']);
		const shown = apiErrorText(answer, 400);
		expect(shown).toMatch(/^the design file is not valid JSON \(/);
		expect(shown.match(/not valid JSON/g)).toHaveLength(1);
		expect(shown).not.toContain('(document)');
		// a field rule the message does not carry is still shown
		expect(apiErrorText({ message: 'x failed', fields: { 'plant.vin': 'must be > 0' } }, 400)).toBe('x failed (plant.vin: must be > 0)');
	});
});
