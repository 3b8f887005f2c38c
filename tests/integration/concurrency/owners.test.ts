// One owner always. Two owners demote each other at the same instant, or remove each other at the
// same instant: exactly one request wins, the other is refused, and the workspace keeps exactly
// one owner. Repeated, because a race that loses only sometimes is still a race. better-auth's own
// organization endpoints for the same changes are refused, so nothing bypasses the locked check.
import '../support/env';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { member } from '../../../src/lib/server/db/schema';
import { servedApp } from '../support/app';
import { signUp, type Client } from '../support/client';
import { createWorkspace, testDb } from '../support/fixtures';

const ROUNDS = 8;
const app = servedApp();
const { db, pool } = testDb();
type User = Client & { userId: string };
let alice: User;
let bob: User;

beforeAll(async () => {
	[alice, bob] = await Promise.all([signUp(app.origin, 'own-alice'), signUp(app.origin, 'own-bob')]);
});

afterAll(async () => {
	await pool.end();
});

/** A fresh workspace where Alice (creator) and Bob are both owners; their member ids. */
async function twoOwners(label: string) {
	const workspaceId = await createWorkspace(alice, label);
	const bobMemberId = randomUUID();
	await db.insert(member).values({ id: bobMemberId, organizationId: workspaceId, userId: bob.userId, role: 'owner', createdAt: new Date() });
	const [aliceRow] = await db.select({ id: member.id }).from(member).where(and(eq(member.organizationId, workspaceId), eq(member.userId, alice.userId)));
	return { workspaceId, aliceMemberId: aliceRow.id, bobMemberId };
}

async function roles(workspaceId: string) {
	return db.select({ userId: member.userId, role: member.role }).from(member).where(eq(member.organizationId, workspaceId));
}

describe('the last owner under concurrent changes', () => {
	it(`two owners demoting each other at once: one wins, one owner remains (${ROUNDS} rounds)`, async () => {
		for (let round = 0; round < ROUNDS; round++) {
			const w = await twoOwners(`demote${round}`);
			const [a, b] = await Promise.all([
				alice.patch(`/api/v1/workspaces/${w.workspaceId}/members/${w.bobMemberId}`, { role: 'engineer' }),
				bob.patch(`/api/v1/workspaces/${w.workspaceId}/members/${w.aliceMemberId}`, { role: 'engineer' })
			]);
			const statuses = [a.status, b.status].sort();
			expect(statuses[0], `round ${round}: ${JSON.stringify([a.body, b.body])}`).toBe(200);
			// The loser either found itself demoted already (403) or would have left no owner (422).
			expect([403, 422], `round ${round}: ${JSON.stringify([a.body, b.body])}`).toContain(statuses[1]);
			const owners = (await roles(w.workspaceId)).filter((r) => r.role === 'owner');
			expect(owners.length, `round ${round}`).toBe(1);
		}
	}, 120_000);

	it(`two owners removing each other at once: one wins, one owner remains (${ROUNDS} rounds)`, async () => {
		for (let round = 0; round < ROUNDS; round++) {
			const w = await twoOwners(`remove${round}`);
			const [a, b] = await Promise.all([
				alice.delete(`/api/v1/workspaces/${w.workspaceId}/members/${w.bobMemberId}`),
				bob.delete(`/api/v1/workspaces/${w.workspaceId}/members/${w.aliceMemberId}`)
			]);
			const statuses = [a.status, b.status].sort();
			expect(statuses[0], `round ${round}: ${JSON.stringify([a.body, b.body])}`).toBe(204);
			// The loser is no longer a member (404) or would have left no owner (422).
			expect([404, 422], `round ${round}`).toContain(statuses[1]);
			const left = await roles(w.workspaceId);
			expect(left.length, `round ${round}`).toBe(1);
			expect(left[0].role).toBe('owner');
		}
	}, 120_000);

	it('a sole owner still cannot demote or remove themselves (422 last-owner)', async () => {
		const workspaceId = await createWorkspace(alice, 'sole');
		const [row] = await db.select({ id: member.id }).from(member).where(eq(member.organizationId, workspaceId));
		const demote = await alice.patch(`/api/v1/workspaces/${workspaceId}/members/${row.id}`, { role: 'viewer' });
		expect(demote.status).toBe(422);
		expect(demote.body.error.code).toBe('last-owner');
		const remove = await alice.delete(`/api/v1/workspaces/${workspaceId}/members/${row.id}`);
		expect(remove.status).toBe(422);
		expect((await roles(workspaceId)).map((r) => r.role)).toEqual(['owner']);
	});
});

describe("better-auth's organization endpoints cannot bypass the rule", () => {
	it('update-member-role, remove-member and leave are refused and change nothing', async () => {
		const w = await twoOwners('bypass');
		const attempts = [
			await alice.post('/api/auth/organization/update-member-role', { memberId: w.bobMemberId, role: 'viewer', organizationId: w.workspaceId }),
			await alice.post('/api/auth/organization/remove-member', { memberIdOrEmail: w.bobMemberId, organizationId: w.workspaceId }),
			await bob.post('/api/auth/organization/leave', { organizationId: w.workspaceId })
		];
		for (const r of attempts) {
			expect(r.status, JSON.stringify(r.body)).toBe(403);
			expect(r.body.code).toBe('USE_WORKSPACE_API');
		}
		expect((await roles(w.workspaceId)).map((r) => r.role)).toEqual(['owner', 'owner']);
	});
});
