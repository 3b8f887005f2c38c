// Template edits are no longer last-write-wins. Two engineers edit the same template version at
// the same instant: one edit lands, the other gets 409 stale-template naming the current version
// and changes nothing; retrying on that version lands too, so both changes are kept. An edit
// without the version it was made on is refused with a field error.
import '../support/env';
import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditLog } from '../../../src/lib/server/db/schema';
import { servedApp } from '../support/app';
import { buildTeam, testDb, type Team } from '../support/fixtures';

const ROUNDS = 6;
const app = servedApp();
const { db, pool } = testDb();
let team: Team;

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
});
afterAll(async () => {
	await pool.end();
});

async function newTemplate(label: string) {
	const reply = await team.as.owner.post(`/api/v1/templates?workspace=${team.workspaceId}`, { name: `${label} ${Date.now()}`, compensator: { kind: 'type2' } });
	expect(reply.status, JSON.stringify(reply.body)).toBe(201);
	return reply.body as { id: string; name: string; updatedAt: string };
}

describe('concurrent template edits', () => {
	it(`two edits of one version at once: one lands, the other is 409 and changes nothing (${ROUNDS} rounds)`, async () => {
		for (let round = 0; round < ROUNDS; round++) {
			const tpl = await newTemplate(`race${round}`);
			const [a, b] = await Promise.all([
				team.as.engineer.patch(`/api/v1/templates/${tpl.id}`, { description: 'from the engineer', baseUpdatedAt: tpl.updatedAt }),
				team.as.owner.patch(`/api/v1/templates/${tpl.id}`, { description: 'from the owner', baseUpdatedAt: tpl.updatedAt })
			]);
			const won = [a, b].filter((r) => r.status === 200);
			const lost = [a, b].filter((r) => r.status === 409);
			expect([won.length, lost.length], `round ${round}: ${JSON.stringify([a.body, b.body]).slice(0, 400)}`).toEqual([1, 1]);
			expect(lost[0].body.error.code).toBe('stale-template');
			expect(lost[0].body.error.message).toMatch(/reload it, merge your change/);
			// The 409 names the version that won.
			expect(lost[0].body.error.current.updatedAt).toBe(won[0].body.updatedAt);
			expect(lost[0].body.error.current.description).toBe(won[0].body.description);
			const stored = (await team.as.viewer.get(`/api/v1/templates/${tpl.id}`)).body;
			expect(stored.description).toBe(won[0].body.description);
			const audited = await db.select().from(auditLog).where(and(eq(auditLog.entityId, tpl.id), eq(auditLog.action, 'template.update')));
			expect(audited.length, `round ${round}`).toBe(1);
		}
	}, 120_000);

	it('the loser retries on the version the 409 names and lands; both edits are kept', async () => {
		const tpl = await newTemplate('retry');
		const first = await team.as.engineer.patch(`/api/v1/templates/${tpl.id}`, { description: 'a new description', baseUpdatedAt: tpl.updatedAt });
		expect(first.status).toBe(200);
		const stale = await team.as.owner.patch(`/api/v1/templates/${tpl.id}`, { name: `${tpl.name} v2`, baseUpdatedAt: tpl.updatedAt });
		expect(stale.status).toBe(409);
		const retried = await team.as.owner.patch(`/api/v1/templates/${tpl.id}`, { name: `${tpl.name} v2`, baseUpdatedAt: stale.body.error.current.updatedAt });
		expect(retried.status, JSON.stringify(retried.body)).toBe(200);
		expect(retried.body).toMatchObject({ name: `${tpl.name} v2`, description: 'a new description' });
		expect(new Date(retried.body.updatedAt).getTime()).toBeGreaterThan(new Date(first.body.updatedAt).getTime());
	});

	it('an edit that does not name its version is refused with a field error', async () => {
		const tpl = await newTemplate('unnamed');
		const reply = await team.as.engineer.patch(`/api/v1/templates/${tpl.id}`, { description: 'blind write' });
		expect(reply.status).toBe(400);
		expect(reply.body.error.fields.baseUpdatedAt).toMatch(/updatedAt/);
	});
});
