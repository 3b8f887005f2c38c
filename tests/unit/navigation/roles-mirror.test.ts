// The browser's list of what each role may do (to hide controls) must agree with the
// server's permission table for every action the pages offer.
import { describe, expect, it } from 'vitest';
import { allows, UI_ACTIONS } from '$lib/client/roles';
import { can, ROLES } from '$lib/server/authz/permissions';

describe('client role mirror', () => {
	it.each(ROLES)('%s: every offered control matches the server table', (role) => {
		for (const action of UI_ACTIONS) expect(allows(role, action), `${role} ${action}`).toBe(can(role, action));
	});

	it('offers nothing to unknown or missing roles', () => {
		for (const action of UI_ACTIONS) {
			expect(allows('member', action)).toBe(false);
			expect(allows(null, action)).toBe(false);
		}
	});
});
