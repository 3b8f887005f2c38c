// A refused action is named in words a member understands ("may not approve a loop"), not by its
// code; the code stays in the body for API clients. Every action has its words.
import { describe, expect, it } from 'vitest';
import { ACTIONS, ACTION_WORDS } from '../../../src/lib/authz';
import { errorBody, forbidden } from '../../../src/lib/server/http/errors';

describe('forbidden', () => {
	it('says what the role may not do in words and keeps the action code for clients', () => {
		const body = errorBody(forbidden('loop.approve'));
		expect(body.error).toMatchObject({ code: 'forbidden', action: 'loop.approve' });
		expect(body.error.message).toBe('your role in this workspace may not approve a loop');
	});
	it('has distinct words for every action, none of them the dotted code', () => {
		const words = ACTIONS.map((a) => ACTION_WORDS[a]);
		expect(new Set(words).size).toBe(ACTIONS.length);
		for (const w of words) expect(w).not.toMatch(/\w\.\w/);
	});
});
