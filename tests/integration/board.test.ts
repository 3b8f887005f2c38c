// The board-health table in one request (GET /api/v1/projects/{id}/board): every rail with its
// latest revision and the headline of the verdict stored with that revision (the database's
// verdict_headline beside `verification`), the caller's role and the workspace's targets;
// every member may read it, a stranger gets 404 and a signed-out caller 401.
import './support/env';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loopRevision } from '../../src/lib/server/db/schema';
import { servedApp } from './support/app';
import { Client } from './support/client';
import { boardWithRails, type SeededBoard } from './support/board';
import { buildTeam, testDb, type Team } from './support/fixtures';

const app = servedApp();
const { db, pool } = testDb();
let team: Team;
let projectId: string;
let railIds: SeededBoard['railIds'];
let saved: SeededBoard['saved'];

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	// B_TWO has two revisions, A_ONE one, C_NONE none.
	const board = await boardWithRails(team, 'Board in one request', { B_TWO: [{ crossoverHz: 20e3 }, { crossoverHz: 45e3 }], A_ONE: [{ crossoverHz: 30e3 }], C_NONE: [] });
	({ projectId, railIds, saved } = board);
});
afterAll(async () => {
	await pool.end();
});

describe('GET /api/v1/projects/{id}/board', () => {
	it('answers every rail by name with its latest revision and that revision’s stored verdict', async () => {
		const reply = await team.as.viewer.get(`/api/v1/projects/${projectId}/board`);
		expect(reply.status).toBe(200);
		const board = reply.body;
		expect(board.project).toMatchObject({ id: projectId, workspaceId: team.workspaceId, name: 'Board in one request' });
		expect(board.targets).toEqual((await team.as.viewer.get(`/api/v1/workspaces/${team.workspaceId}`)).body.marginTargets);
		expect(board).toMatchObject({ total: 3, truncated: false });
		expect(board.rails.map((r: { name: string }) => r.name)).toEqual(['A_ONE', 'B_TWO', 'C_NONE']);

		for (const name of ['A_ONE', 'B_TWO']) {
			const row = board.rails.find((r: { name: string }) => r.name === name);
			const last = saved[name].at(-1)!;
			expect(row.latestRevision).toBe(last.revision);
			expect(row.latest).toMatchObject({ id: last.id, revision: last.revision, status: 'draft' });
			// The stored verdict of that revision, as the single-revision endpoint gives it.
			const stored = (await team.as.viewer.get(`/api/v1/loops/${last.id}`)).body.verification;
			const v = row.latest.verification;
			expect(v.status).toBe(stored.status);
			expect(v.summary).toBe(stored.summary);
			expect(v.rows).toEqual(stored.rows);
			expect(v.worst).toEqual(stored.worst);
			expect(v.targets).toEqual(stored.targets);
			expect(v.spread).toEqual(stored.spread);
			expect(v.engineVersion).toBe(stored.engineVersion);
			expect(v.corners).toEqual({ mode: stored.corners.mode, count: stored.corners.count, unstable: stored.corners.unstable, failed: stored.corners.failed });
			// The corner list, warnings and parts (most of the stored size) stay out of the table.
			expect(v).not.toHaveProperty('warnings');
			expect(v).not.toHaveProperty('parts');
		}
		// A row carries what the table shows and the rail form edits, never the rail's spec
		// sections, tolerances or targets, nor the revision's author and message.
		const rail = (await team.as.viewer.get(`/api/v1/rails/${railIds['A_ONE']}`)).body;
		const row = board.rails.find((r: { name: string }) => r.name === 'A_ONE');
		expect(Object.keys(row).sort()).toEqual(['fsw', 'id', 'ioutMax', 'ioutMin', 'ioutNom', 'latest', 'latestRevision', 'name', 'notes', 'topology', 'verdictFlag', 'vinMax', 'vinMin', 'vinNom', 'vout']);
		for (const key of ['name', 'topology', 'vout', 'vinNom', 'vinMin', 'vinMax', 'ioutNom', 'ioutMin', 'ioutMax', 'fsw', 'notes', 'verdictFlag', 'latestRevision']) expect(row[key]).toEqual(rail[key]);
		expect(Object.keys(row.latest).sort()).toEqual(['id', 'revision', 'status', 'verification']);
		const none = board.rails.find((r: { name: string }) => r.name === 'C_NONE');
		expect(none.latest).toBeNull();
		expect(none.latestRevision).toBeNull();
	});

	it('follows the stored verdict (a re-verification that rewrites it shows at once), never recomputing it', async () => {
		const last = saved['A_ONE'].at(-1)!;
		const [row] = await db.select({ verification: loopRevision.verification }).from(loopRevision).where(eq(loopRevision.id, last.id));
		const rewritten = { ...row.verification!, status: 'fail' as const, summary: 'rewritten by the test' };
		await db.update(loopRevision).set({ verification: rewritten }).where(eq(loopRevision.id, last.id));
		try {
			const board = (await team.as.owner.get(`/api/v1/projects/${projectId}/board`)).body;
			const a = board.rails.find((r: { name: string }) => r.name === 'A_ONE');
			expect(a.latest.verification).toMatchObject({ status: 'fail', summary: 'rewritten by the test' });
		} finally {
			await db.update(loopRevision).set({ verification: row.verification }).where(eq(loopRevision.id, last.id));
		}
	});

	it('tells each member their role; a stranger gets 404 and a signed-out caller 401', async () => {
		for (const role of ['owner', 'engineer', 'reviewer', 'viewer'] as const) {
			const reply = await team.as[role].get(`/api/v1/projects/${projectId}/board`);
			expect(reply.status).toBe(200);
			expect(reply.body.role).toBe(role);
		}
		const stranger = await team.outsider.get(`/api/v1/projects/${projectId}/board`);
		expect(stranger.status).toBe(404);
		expect(stranger.body.error.code).toBe('not-found');
		// A board id that does not exist reads the same as another workspace's.
		expect((await team.outsider.get(`/api/v1/projects/${randomUUID()}/board`)).status).toBe(404);
		expect((await new Client(app.origin).get(`/api/v1/projects/${projectId}/board`)).status).toBe(401);
	});
});
