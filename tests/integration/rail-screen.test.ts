// The rail design screen in one request (GET /api/v1/rails/{id}/screen) and the page drawn from
// it: the rail with its spec, the caller's role, the latest revision's design without the stored
// verdict, the history newest first, the latest revision's review requests with who could be
// asked, and the bench files. Every member may read it; another workspace's rail is 404 and a
// signed-out caller 401. The page is rendered by the server with that data, and a viewer's
// page has no save form.
import './support/env';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, can } from '../../src/lib/authz';
import { servedApp } from './support/app';
import { Client } from './support/client';
import { boardWithRails, type SeededBoard } from './support/board';
import { buildTeam, testDb, type Team } from './support/fixtures';

const app = servedApp();
const { pool, db } = testDb();
let team: Team;
let projectId: string;
let railId: string;
let emptyRailId: string;
let saved: SeededBoard['saved'][string];

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	const board = await boardWithRails(team, 'Screen board', { SCREEN_RAIL: [{ crossoverHz: 20e3 }, { crossoverHz: 35e3 }], EMPTY_RAIL: [] });
	({ projectId } = board);
	railId = board.railIds.SCREEN_RAIL;
	emptyRailId = board.railIds.EMPTY_RAIL;
	saved = board.saved.SCREEN_RAIL;
	const asked = await team.as.engineer.post(`/api/v1/loops/${saved[1].id}/review`, { action: 'request-review', reviewerIds: [team.as.reviewer.userId] });
	expect(asked.status, JSON.stringify(asked.body)).toBe(200);
	const bench = await team.as.engineer.post(`/api/v1/rails/${railId}/bench`, {
		fileName: 'loop.csv',
		text: 'Frequency (Hz),Gain (dB),Phase (deg)\n1000,30,-100\n10000,10,-120\n100000,-10,-140\n',
		metadata: { kind: 'loop' }
	});
	expect(bench.status, JSON.stringify(bench.body)).toBe(201);
});
afterAll(async () => {
	await pool.end();
});

describe('GET /api/v1/rails/{id}/screen', () => {
	it('answers what the separate rail, loop, review and bench endpoints answer, in one reply', async () => {
		const reply = await team.as.viewer.get(`/api/v1/rails/${railId}/screen`);
		expect(reply.status).toBe(200);
		const screen = reply.body;
		const rail = (await team.as.viewer.get(`/api/v1/rails/${railId}`)).body;
		expect(screen.rail).toEqual(rail);
		expect(screen.rail.latestRevision).toBe(2);

		const loop = (await team.as.viewer.get(`/api/v1/loops/${saved[1].id}`)).body;
		expect(screen.latest).toMatchObject({ id: saved[1].id, revision: 2, status: 'in-review', message: 'fc 35000' });
		expect(screen.latest.design).toEqual(loop.design);
		// The stored verdict (with its corner list, the heaviest column) stays out: the screen computes its own.
		expect(screen.latest).not.toHaveProperty('verification');

		expect(screen.history.total).toBe(2);
		expect(screen.history.items.map((i: { revision: number }) => i.revision)).toEqual([2, 1]);
		expect(screen.history.items[0]).not.toHaveProperty('verification');
		expect(screen.history.items[0]).not.toHaveProperty('design');

		const review = (await team.as.viewer.get(`/api/v1/loops/${saved[1].id}/review`)).body;
		expect(screen.review).toEqual({ requests: review.requests, candidates: review.candidates });
		expect(screen.review.requests.map((r: { reviewerId: string }) => r.reviewerId)).toEqual([team.as.reviewer.userId]);
		// Owners and reviewers may be asked; never the author (the engineer).
		expect(screen.review.candidates.map((c: { userId: string }) => c.userId).sort()).toEqual([team.as.owner.userId, team.as.reviewer.userId].sort());

		const bench = (await team.as.viewer.get(`/api/v1/rails/${railId}/bench`)).body;
		expect(screen.bench).toEqual(bench);
		expect(screen.bench.items.map((b: { fileName: string }) => b.fileName)).toEqual(['loop.csv']);
	});

	it('answers a rail without a saved loop with no latest revision and no review', async () => {
		const screen = (await team.as.engineer.get(`/api/v1/rails/${emptyRailId}/screen`)).body;
		expect(screen).toMatchObject({ latest: null, review: null, history: { items: [], total: 0 }, bench: { items: [] }, role: 'engineer' });
		expect(screen.rail).toMatchObject({ id: emptyRailId, name: 'EMPTY_RAIL', latestRevision: null });
	});

	it('tells each member their role; a stranger and an unknown id get 404, a signed-out caller 401', async () => {
		for (const role of ROLES) {
			const reply = await team.as[role].get(`/api/v1/rails/${railId}/screen`);
			expect(reply.status, role).toBe(200);
			expect(reply.body.role).toBe(role);
		}
		const stranger = await team.outsider.get(`/api/v1/rails/${railId}/screen`);
		expect(stranger.status).toBe(404);
		expect(stranger.body.error.code).toBe('not-found');
		expect((await team.outsider.get(`/api/v1/rails/${randomUUID()}/screen`)).status).toBe(404);
		expect((await new Client(app.origin).get(`/api/v1/rails/${railId}/screen`)).status).toBe(401);
	});

	it('answers 404 to an API token bound to another workspace of the same user', async () => {
		const other = await team.as.owner.post('/api/v1/workspaces', { name: 'Owner side', slug: `side-${randomUUID().slice(0, 8)}` });
		const token = await team.as.owner.post('/api/v1/tokens', { name: 'side only', workspaceId: other.body.id });
		expect(token.status, JSON.stringify(token.body)).toBe(201);
		const scripted = new Client(app.origin);
		scripted.token = token.body.token;
		expect((await scripted.get(`/api/v1/rails/${railId}/screen`)).status).toBe(404);
	});
});

describe('the rail page', () => {
	const page = (who: Client, path: string) => who.request<string>('GET', path, undefined, { accept: 'text/html' });
	const railPath = () => `/w/${team.workspaceId}/projects/${projectId}/rails/${railId}`;

	it('is rendered by the server with the rail, its latest revision and the design inputs', async () => {
		const reply = await page(team.as.viewer, railPath());
		expect(reply.status).toBe(200);
		expect(reply.body).toMatch(/data-testid="rail-name"[^>]*>SCREEN_RAIL</);
		expect(reply.body).toMatch(/data-testid="rail-revision"[^>]*>Loop r2 · in review</);
		expect(reply.body).toContain('data-testid="design-inputs"');
		expect(reply.body).toContain('data-testid="history-toggle"');
	});

	it('offers the save form to the roles that may save, and to no other', async () => {
		for (const role of ROLES) {
			const html = (await page(team.as[role], railPath())).body;
			expect(html.includes('data-testid="save-form"'), role).toBe(can(role, 'loop.save'));
		}
	});

	it("answers 404 for another workspace's rail and for a rail under the wrong board", async () => {
		expect((await page(team.outsider, railPath())).status).toBe(404);
		const otherBoard = (await team.as.owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: 'Other board' })).body.id;
		expect((await page(team.as.viewer, `/w/${team.workspaceId}/projects/${otherBoard}/rails/${railId}`)).status).toBe(404);
	});
});
