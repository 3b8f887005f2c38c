// Twenty engineers saving on the same loop revision at the same instant: exactly one save
// wins, the others get 409 naming the revision that won, no revision number is used twice,
// and the audit log holds one loop.save entry for every save that succeeded. Then the same
// ten keep retrying on the revision the 409 names until each has saved once: the numbers run
// 1…11 without gap or repeat and the audit log has all of them.
import '../support/env';
import { randomUUID } from 'node:crypto';
import { and, eq, inArray } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditLog, loopRevision, member } from '../../../src/lib/server/db/schema';
import { servedApp } from '../support/app';
import { signUp, type Client } from '../support/client';
import { buckDesign } from '../support/designs';
import { createWorkspace, railBody, testDb } from '../support/fixtures';

const CLIENTS = 20;
/** Clients in the retry round: ten already make about 55 saves queue on one rail lock. */
const RETRYING = 10;
const app = servedApp();
const { db, pool } = testDb();
let owner: Client & { userId: string };
let engineers: (Client & { userId: string })[];
let workspaceId: string;
let projectId: string;

beforeAll(async () => {
	owner = await signUp(app.origin, 'conc-owner');
	workspaceId = await createWorkspace(owner, 'concurrency');
	projectId = (await owner.post(`/api/v1/projects?workspace=${workspaceId}`, { name: 'Concurrency board' })).body.id;
	engineers = await Promise.all(Array.from({ length: CLIENTS }, (_, i) => signUp(app.origin, `conc-eng${i}`)));
	await db.insert(member).values(engineers.map((e) => ({ id: randomUUID(), organizationId: workspaceId, userId: e.userId, role: 'engineer', createdAt: new Date() })));
}, 120_000);

afterAll(async () => {
	await pool.end();
});

async function freshRailWithFirstRevision(name: string) {
	const railId = (await owner.post(`/api/v1/projects/${projectId}/rails`, railBody(name))).body.id as string;
	const first = await owner.post(`/api/v1/rails/${railId}/loops`, { baseRevision: null, design: buckDesign(), message: 'r1' });
	expect(first.status).toBe(201);
	return railId;
}

async function storedRevisions(railId: string) {
	return db.select({ id: loopRevision.id, revision: loopRevision.revision, authorId: loopRevision.authorId }).from(loopRevision).where(eq(loopRevision.railId, railId));
}

async function auditedSaves(loopIds: string[]) {
	return db
		.select({ entityId: auditLog.entityId, actorId: auditLog.actorId })
		.from(auditLog)
		.where(and(eq(auditLog.workspaceId, workspaceId), eq(auditLog.action, 'loop.save'), inArray(auditLog.entityId, loopIds)));
}

const save = (who: Client, railId: string, base: number, i: number) =>
	who.post(`/api/v1/rails/${railId}/loops`, { baseRevision: base, design: buckDesign({ crossoverHz: 30_000 + 500 * i }), message: `edit ${i}` });

describe(`${CLIENTS} concurrent saves on one base revision`, () => {
	it('one wins, the rest get 409 naming the winner, numbers unique, every success audited', async () => {
		const railId = await freshRailWithFirstRevision('CONC_ONCE');
		const replies = await Promise.all(engineers.map((e, i) => save(e, railId, 1, i)));
		const wins = replies.filter((r) => r.status === 201);
		const conflicts = replies.filter((r) => r.status === 409);
		expect(wins.length).toBe(1);
		expect(conflicts.length).toBe(CLIENTS - 1);
		expect(wins[0].body.revision).toBe(2);
		for (const c of conflicts) {
			expect(c.body.error.code).toBe('stale-revision');
			expect(c.body.error.currentRevision).toBe(2);
			expect(c.body.error.current.id).toBe(wins[0].body.id);
		}
		const stored = await storedRevisions(railId);
		expect(stored.map((r) => r.revision).sort()).toEqual([1, 2]);
		const audited = await auditedSaves(stored.map((r) => r.id));
		expect(audited.map((a) => a.entityId).sort()).toEqual(stored.map((r) => r.id).sort());
	}, 60_000);

	it('retrying on the revision each 409 names, ten clients all land once: revisions 1…11, no gap, no repeat, all audited', async () => {
		const railId = await freshRailWithFirstRevision('CONC_RETRY');
		const retrying = engineers.slice(0, RETRYING);
		let attempts = 0;
		const saved = await Promise.all(
			retrying.map(async (e, i) => {
				let base = 1;
				for (;;) {
					attempts++;
					const r = await save(e, railId, base, i);
					if (r.status === 201) return r.body as { id: string; revision: number };
					expect(r.status, JSON.stringify(r.body).slice(0, 200)).toBe(409);
					base = r.body.error.currentRevision;
				}
			})
		);
		expect(attempts).toBeGreaterThan(RETRYING); // the contention was real
		const stored = await storedRevisions(railId);
		expect(stored.map((r) => r.revision).sort((a, b) => a - b)).toEqual(Array.from({ length: RETRYING + 1 }, (_, i) => i + 1));
		// Each engineer authored exactly one revision, the one their 201 named.
		for (const [i, e] of retrying.entries()) {
			const mine = stored.filter((r) => r.authorId === e.userId);
			expect(mine.map((r) => r.id)).toEqual([saved[i].id]);
		}
		const audited = await auditedSaves(stored.map((r) => r.id));
		expect(audited.length).toBe(RETRYING + 1);
		expect(new Set(audited.map((a) => a.entityId)).size).toBe(RETRYING + 1);
	}, 120_000);
});
