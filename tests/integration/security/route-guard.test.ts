// Authorization coverage, found from the route files so a new route is covered the day it is
// added. Statically: every /api/v1 handler calls the guard (authorize, authorizeRow or
// requireCaller) before it reads the body, every route with an id checks the caller's role,
// and every page action and signed-in load checks the caller. Dynamically: every handler,
// called signed out, answers 401; called by a signed-in member of another workspace with
// this workspace's ids, answers 404 (another workspace's rows look like rows that do not exist);
// every signed-in page sends a signed-out visitor to the sign-in page.
import '../support/env';
import { randomUUID } from 'node:crypto';
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { invitation, member } from '../../../src/lib/server/db/schema';
import { and, eq } from 'drizzle-orm';
import { servedApp } from '../support/app';
import { Client, signUp } from '../support/client';
import { buckDesign } from '../support/designs';
import { buildTeam, railBody, testDb, type Team } from '../support/fixtures';
import { apiHandlers, BODY_CALLS, firstIndex, GUARD_CALLS, pageServerExports, ROLE_CALLS, ROUTES_DIR, routeOf } from './routes';

const app = servedApp();
const { db, pool } = testDb();
let team: Team;
const ids: Record<string, string> = {};

/** Needs no caller: the API description (never data), and a script's first token from e-mail and password (the way in, like the sign-in form). */
const PUBLIC_API = ['GET /api/v1/openapi.json', 'POST /api/v1/tokens/sign-in'];
/** Routes with an id that belong to the caller personally (checked by user id, not by role). */
const PERSONAL_ID_ROUTES = ['/api/v1/tokens/[id]'];
/** Page actions that serve signed-out visitors by design (they are the way in), or hand the session to better-auth. */
const ACCOUNT_ACTIONS = ['/sign-in default', '/sign-up default', '/forgot-password default', '/reset-password default', '/sign-out default'];
/** Page loads that read the database without a role: the invitation link shows whom it invites (its id is the secret). */
const PUBLIC_LOADS_WITH_DATA = ['/invitations/[id]'];
/** Page trees only signed-in users may open (hooks.server.ts). */
const SIGNED_IN_AREAS = ['/w', '/app', '/settings'];

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	const owner = team.as.owner;
	ids.workspace = team.workspaceId;
	ids.project = (await owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: 'Guard board' })).body.id;
	ids.rail = (await owner.post(`/api/v1/projects/${ids.project}/rails`, railBody('GUARD_RAIL'))).body.id;
	ids.loop = (await owner.post(`/api/v1/rails/${ids.rail}/loops`, { baseRevision: null, design: buckDesign(), message: 'guarded' })).body.id;
	ids.template = (await owner.post(`/api/v1/templates?workspace=${team.workspaceId}`, { name: 'Guard template', compensator: { kind: 'type2' } })).body.id;
	ids.token = (await owner.post('/api/v1/tokens', { name: 'guard' })).body.id;
	const [row] = await db.select({ id: member.id }).from(member).where(and(eq(member.organizationId, team.workspaceId), eq(member.userId, team.as.engineer.userId)));
	ids.member = row.id;
	ids.invitation = randomUUID();
	await db.insert(invitation).values({
		id: ids.invitation,
		organizationId: team.workspaceId,
		email: 'guard-invitee@example.test',
		role: 'viewer',
		status: 'pending',
		expiresAt: new Date(Date.now() + 86_400_000),
		inviterId: owner.userId
	});
	for (const [k, v] of Object.entries(ids)) if (!v) throw new Error(`set-up failed: no ${k} id`);
});

afterAll(async () => {
	await pool.end();
});

/** Which stored row a route parameter names, by the collection segment before it. */
const PARAM_ROWS: Record<string, string> = {
	'workspaces/[id]': 'workspace',
	'projects/[id]': 'project',
	'rails/[id]': 'rail',
	'loops/[id]': 'loop',
	'templates/[id]': 'template',
	'tokens/[id]': 'token',
	'tokens/[tokenId]': 'token',
	'members/[memberId]': 'member',
	'invitations/[invitationId]': 'invitation'
};

/** A concrete path for a route pattern, with this workspace's ids; unknown parameters get a fresh id and are listed. */
function concrete(route: string, unresolved: string[]): string {
	const segments = route.split('/');
	return segments
		.map((segment, i) => {
			if (!/^\[.+\]$/.test(segment)) return segment;
			const row = PARAM_ROWS[`${segments[i - 1]}/${segment}`];
			if (row) return ids[row];
			unresolved.push(`${route} ${segment}`);
			return randomUUID();
		})
		.join('/');
}

const label = (h: { method: string; route: string }) => `${h.method} ${h.route}`;

describe('every /api/v1 handler calls the role check (static)', () => {
	const handlers = apiHandlers();

	it('finds the handlers', () => {
		expect(handlers.length).toBeGreaterThan(25);
	});

	it('each one calls the guard, except the public API description', () => {
		const unguarded = handlers.filter((h) => firstIndex(h.source, GUARD_CALLS) < 0).map(label);
		expect(unguarded.sort()).toEqual([...PUBLIC_API].sort());
	});

	it('each one calls the guard before reading the body', () => {
		const late = handlers.filter((h) => {
			const body = firstIndex(h.source, BODY_CALLS);
			return body >= 0 && firstIndex(h.source, GUARD_CALLS) > body;
		});
		expect(late.map(label)).toEqual([]);
	});

	it('each route with an id checks the role in the row’s workspace (authorize or authorizeRow)', () => {
		const missing = handlers.filter((h) => h.route.includes('[') && !PERSONAL_ID_ROUTES.includes(h.route) && firstIndex(h.source, ROLE_CALLS) < 0);
		expect(missing.map(label)).toEqual([]);
	});
});

describe('every page action and signed-in load checks the caller (static)', () => {
	const exports = pageServerExports();

	it('actions check locals.user or the guard, unless they are the account forms', () => {
		const actions = exports.filter((e) => e.kind === 'action');
		expect(actions.length).toBeGreaterThan(0);
		const open = actions.filter((a) => !ACCOUNT_ACTIONS.includes(`${a.route} ${a.name}`) && !/locals\.user/.test(a.source) && firstIndex(a.source, GUARD_CALLS) < 0);
		expect(open.map((a) => `${a.route} ${a.name} (${a.file})`)).toEqual([]);
	});

	it('loads that read the database check a role (or are the invitation link)', () => {
		const reading = exports.filter((e) => e.kind === 'load' && /\bdb\b|services\//.test(e.source));
		const open = reading.filter((e) => !PUBLIC_LOADS_WITH_DATA.includes(e.route) && firstIndex(e.source, ROLE_CALLS) < 0 && !/\bcan\(/.test(e.source));
		expect(open.map((e) => `${e.route} (${e.file})`)).toEqual([]);
	});
});

describe('every /api/v1 handler refuses strangers (dynamic)', () => {
	const handlers = apiHandlers();
	const unresolved: string[] = [];
	// Collection routes that address a workspace by ?workspace= (the home reads every workspace of the caller without it).
	const withQuery = (h: (typeof handlers)[number], path: string) =>
		h.source.includes('requestedWorkspaceId(') || h.source.includes('homeQuerySchema') ? `${path}?workspace=${ids.workspace}` : path;
	const bodyFor = (method: string) => (method === 'GET' || method === 'DELETE' ? undefined : {});

	it('answers 401 to a signed-out caller and to a forged token', async () => {
		const anonymous = new Client(app.origin);
		const forged = new Client(app.origin);
		forged.token = 'lw_' + 'x'.repeat(43);
		const wrong: string[] = [];
		for (const h of handlers.filter((h) => !PUBLIC_API.includes(label(h)))) {
			const path = withQuery(h, concrete(h.route, unresolved));
			for (const [who, client] of [['signed out', anonymous], ['forged token', forged]] as const) {
				const reply = await client.request(h.method, path, bodyFor(h.method));
				if (reply.status !== 401) wrong.push(`${label(h)} ${who}: ${reply.status}`);
			}
		}
		expect(wrong).toEqual([]);
	});

	it('answers 404 to a member of another workspace using this workspace’s ids', async () => {
		const scoped = handlers.filter((h) => firstIndex(h.source, ROLE_CALLS) >= 0 || PERSONAL_ID_ROUTES.includes(h.route));
		expect(scoped.length).toBeGreaterThan(20);
		const wrong: string[] = [];
		for (const h of scoped) {
			const path = withQuery(h, concrete(h.route, unresolved));
			const reply = await team.outsider.request(h.method, path, bodyFor(h.method));
			if (reply.status !== 404) wrong.push(`${label(h)}: ${reply.status} ${JSON.stringify(reply.body).slice(0, 120)}`);
		}
		expect(wrong).toEqual([]);
		// The rows are still there for their own workspace: the 404s were refusals, not deletions.
		expect((await team.as.owner.get(`/api/v1/projects/${ids.project}`)).status).toBe(200);
		expect((await team.as.owner.get(`/api/v1/loops/${ids.loop}`)).status).toBe(200);
		if (unresolved.length) console.info(`[route-guard] parameters without a known row (tried with a fresh id): ${[...new Set(unresolved)].join(', ')}`);
	});

	it('a member whose role is not one of ours (better-auth’s admin or member) is refused every workspace route with 403', async () => {
		const stranger = await signUp(app.origin, 'foreign-role');
		await db.insert(member).values({ id: randomUUID(), organizationId: team.workspaceId, userId: stranger.userId, role: 'admin', createdAt: new Date() });
		const wrong: string[] = [];
		for (const h of handlers.filter((h) => firstIndex(h.source, ROLE_CALLS) >= 0)) {
			const missing: string[] = [];
			const path = withQuery(h, concrete(h.route, missing));
			if (missing.length) continue; // a fresh id is 404 before any role is asked
			const reply = await stranger.request(h.method, path, bodyFor(h.method));
			if (reply.status !== 403) wrong.push(`${label(h)}: ${reply.status} ${JSON.stringify(reply.body).slice(0, 120)}`);
		}
		expect(wrong).toEqual([]);
	});

	it('an owner cannot reach another workspace’s member or invitation through their own workspace id', async () => {
		const [foreign] = await db.select({ id: member.id }).from(member).where(eq(member.organizationId, team.outsiderWorkspaceId));
		const patch = await team.as.owner.patch(`/api/v1/workspaces/${team.workspaceId}/members/${foreign.id}`, { role: 'viewer' });
		expect(patch.status).toBe(404);
		const remove = await team.as.owner.delete(`/api/v1/workspaces/${team.workspaceId}/members/${foreign.id}`);
		expect(remove.status).toBe(404);
		const [still] = await db.select({ role: member.role }).from(member).where(eq(member.id, foreign.id));
		expect(still.role).toBe('owner');
	});
});

describe('every signed-in page turns a signed-out visitor to the sign-in page (dynamic)', () => {
	it('redirects with 303 to /sign-in and back', async () => {
		const pages: string[] = [];
		const walk = (dir: string) => {
			for (const name of readdirSync(dir)) {
				const full = join(dir, name);
				if (statSync(full).isDirectory()) walk(full);
				else if (name === '+page.svelte') pages.push(routeOf(full));
			}
		};
		walk(ROUTES_DIR);
		const guarded = pages.filter((p) => SIGNED_IN_AREAS.some((a) => p === a || p.startsWith(`${a}/`)));
		expect(guarded.length).toBeGreaterThan(2);
		const anonymous = new Client(app.origin);
		const wrong: string[] = [];
		for (const page of guarded) {
			const path = page.replace(/\[[^\]]+\]/g, () => randomUUID());
			const reply = await fetch(app.origin + path, { redirect: 'manual' });
			const location = reply.headers.get('location') ?? '';
			if (reply.status !== 303 || !location.startsWith('/sign-in?redirectTo=')) wrong.push(`${page}: ${reply.status} → ${location}`);
			await reply.text();
		}
		expect(wrong).toEqual([]);
		expect(anonymous.cookie).toBe('');
	});
});
