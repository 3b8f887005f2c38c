// Pages hide controls with `can(role, action)` from $lib/authz; the API decides with the
// server's guard. This checks that the guard's answers (403 / 404 / pass) are exactly what
// `can()` says for every role and action, so a control the page shows is one the API allows.
// The membership lookup is replaced by a stub returning the role under test (no database).
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { ACTIONS, can, ROLES } from '../../../src/lib/authz';

const state = vi.hoisted(() => ({ role: null as string | null }));

vi.mock('../../../src/lib/server/db', () => {
	const rows = () => (state.role === null ? [] : [{ role: state.role }]);
	const chain = { from: () => chain, where: () => chain, limit: async () => rows() };
	return { db: { select: () => chain } };
});

const { authorize } = await import('../../../src/lib/server/authz/guard');
const { ApiError } = await import('../../../src/lib/server/http/errors');

const event = { locals: { user: { id: 'u1', email: 'a@example.test', name: 'A' } } } as unknown as RequestEvent;

async function statusOf(action: (typeof ACTIONS)[number]): Promise<number> {
	try {
		await authorize(event, 'ws1', action);
		return 200;
	} catch (e) {
		if (e instanceof ApiError) return e.status;
		throw e;
	}
}

describe('the server guard decides with the table pages read', () => {
	beforeEach(() => {
		state.role = null;
	});

	it.each(ROLES)('%s: 200 exactly where can() is true, 403 elsewhere', async (role) => {
		state.role = role;
		for (const action of ACTIONS) expect(await statusOf(action), `${role} ${action}`).toBe(can(role, action) ? 200 : 403);
	});

	it("a member row with better-auth's own name ('member') gets 403 everywhere, as can() says", async () => {
		state.role = 'member';
		for (const action of ACTIONS) {
			expect(can('member', action)).toBe(false);
			expect(await statusOf(action)).toBe(403);
		}
	});

	it('a non-member gets 404 (another workspace looks like one that does not exist)', async () => {
		for (const action of ACTIONS) expect(await statusOf(action)).toBe(404);
	});
});
