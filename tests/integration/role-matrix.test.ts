// Every /api/v1 route tried by every role: the answer must follow the permission table
// (2xx where the role may, 403 where it may not), signed-out callers get 401, and a test
// walks the route files so a new route without a row here fails.
import './support/env';
import { randomUUID } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { can, ROLES, type Action, type Role } from '../../src/lib/authz';
import { documentedRoutes } from '../../src/lib/server/openapi';
import { invitation, loopRevision, member, user, type LoopStatus } from '../../src/lib/server/db/schema';
import { servedApp } from './support/app';
import { Client } from './support/client';
import { buckDesign } from './support/designs';
import { buildTeam, railBody, testDb, type Team } from './support/fixtures';

const app = servedApp();
let team: Team;
const { db, pool } = testDb();
let projectId: string;
let railId: string;
let loopId: string;
let templateId: string;

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	const owner = team.as.owner;
	projectId = (await owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: 'Matrix board' })).body.id;
	railId = (await owner.post(`/api/v1/projects/${projectId}/rails`, railBody())).body.id;
	loopId = (await owner.post(`/api/v1/rails/${railId}/loops`, { baseRevision: null, design: buckDesign(), message: 'first cut' })).body.id;
	templateId = (await owner.post(`/api/v1/templates?workspace=${team.workspaceId}`, { name: 'Matrix template', compensator: { kind: 'type2' } })).body.id;
});

afterAll(async () => {
	await pool.end();
});

const owner = () => team.as.owner;
const ws = () => team.workspaceId;
const unique = (label: string) => `${label}-${randomUUID().slice(0, 6)}`;
const railName = () => `R${randomUUID().slice(0, 6).toUpperCase().replace(/-/g, '')}_X`;

async function freshProject() {
	return (await owner().post(`/api/v1/projects?workspace=${ws()}`, { name: unique('board') })).body.id as string;
}
async function freshRail() {
	return (await owner().post(`/api/v1/projects/${projectId}/rails`, railBody(railName()))).body.id as string;
}
/** A stored revision in a given status, written directly: set-up, not the behaviour under test. */
async function loopInStatus(status: LoopStatus) {
	const rail = await freshRail();
	const id = randomUUID();
	await db.insert(loopRevision).values({
		id,
		workspaceId: ws(),
		railId: rail,
		revision: 1,
		schemaVersion: 1,
		design: buckDesign(),
		message: 'set-up',
		status,
		// Written by the engineer, so the owner and the reviewer may decide on it (never the author).
		authorId: team.as.engineer.userId,
		createdAt: new Date()
	});
	return id;
}
/** A small analyzer file (frequency, gain, phase) uploaded by the owner; set-up for the bench rows. */
const BENCH_CSV = 'Frequency (Hz),Gain (dB),Phase (deg)\n1000,40,-95\n10000,20,-120\n40000,0,-125\n100000,-15,-150\n';
/** Enough points for a fit (at least ten in the band): an integrator-like slope, invented numbers. */
const FIT_CSV = ['Frequency (Hz),Gain (dB),Phase (deg)', ...Array.from({ length: 12 }, (_, i) => `${1000 * 10 ** (i / 6)},${40 - (20 * i) / 6},${-95 - 3 * i}`)].join('\n');
async function freshBench(text = BENCH_CSV) {
	return (await owner().post(`/api/v1/rails/${railId}/bench`, { fileName: 'matrix.csv', text, metadata: { vin: 12, iout: 2 } })).body.id as string;
}
async function freshMember() {
	const userId = randomUUID();
	await db.insert(user).values({ id: userId, name: 'Extra member', email: `${unique('extra')}@example.test`, emailVerified: false });
	const id = randomUUID();
	await db.insert(member).values({ id, organizationId: ws(), userId, role: 'viewer', createdAt: new Date() });
	return id;
}
async function freshInvitation() {
	const id = randomUUID();
	await db.insert(invitation).values({
		id,
		organizationId: ws(),
		email: `${unique('invitee')}@example.test`,
		role: 'viewer',
		status: 'pending',
		expiresAt: new Date(Date.now() + 86_400_000),
		inviterId: team.as.owner.userId
	});
	return id;
}

interface RouteCase {
	method: 'GET' | 'POST' | 'PATCH' | 'DELETE';
	/** The route as its folder names it, e.g. /api/v1/projects/[id]. */
	route: string;
	action: Action;
	/** Builds the concrete request; may create rows the request then consumes. */
	prepare: () => Promise<{ path: string; body?: unknown }>;
}

const cases: RouteCase[] = [
	{ method: 'GET', route: '/api/v1/workspaces/[id]', action: 'workspace.read', prepare: async () => ({ path: `/api/v1/workspaces/${ws()}` }) },
	{
		method: 'PATCH',
		route: '/api/v1/workspaces/[id]',
		action: 'workspace.update',
		prepare: async () => ({ path: `/api/v1/workspaces/${ws()}`, body: { marginTargets: { phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 } } })
	},
	{ method: 'GET', route: '/api/v1/workspaces/[id]/members', action: 'member.read', prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/members` }) },
	{
		method: 'PATCH',
		route: '/api/v1/workspaces/[id]/members/[memberId]',
		action: 'member.updateRole',
		prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/members/${await freshMember()}`, body: { role: 'reviewer' } })
	},
	{
		method: 'DELETE',
		route: '/api/v1/workspaces/[id]/members/[memberId]',
		action: 'member.remove',
		prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/members/${await freshMember()}` })
	},
	{ method: 'GET', route: '/api/v1/workspaces/[id]/invitations', action: 'member.invite', prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/invitations` }) },
	{
		method: 'POST',
		route: '/api/v1/workspaces/[id]/invitations',
		action: 'member.invite',
		prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/invitations`, body: { email: `${unique('invitee')}@example.test`, role: 'viewer' } })
	},
	{
		method: 'DELETE',
		route: '/api/v1/workspaces/[id]/invitations/[invitationId]',
		action: 'member.invite',
		prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/invitations/${await freshInvitation()}` })
	},
	{ method: 'GET', route: '/api/v1/projects', action: 'project.read', prepare: async () => ({ path: `/api/v1/projects?workspace=${ws()}` }) },
	{ method: 'POST', route: '/api/v1/projects', action: 'project.create', prepare: async () => ({ path: `/api/v1/projects?workspace=${ws()}`, body: { name: unique('board') } }) },
	{ method: 'GET', route: '/api/v1/projects/[id]', action: 'project.read', prepare: async () => ({ path: `/api/v1/projects/${projectId}` }) },
	{ method: 'PATCH', route: '/api/v1/projects/[id]', action: 'project.update', prepare: async () => ({ path: `/api/v1/projects/${projectId}`, body: { description: unique('d') } }) },
	{ method: 'DELETE', route: '/api/v1/projects/[id]', action: 'project.delete', prepare: async () => ({ path: `/api/v1/projects/${await freshProject()}` }) },
	{ method: 'GET', route: '/api/v1/projects/[id]/rails', action: 'rail.read', prepare: async () => ({ path: `/api/v1/projects/${projectId}/rails` }) },
	{ method: 'POST', route: '/api/v1/projects/[id]/rails', action: 'rail.create', prepare: async () => ({ path: `/api/v1/projects/${projectId}/rails`, body: railBody(railName()) }) },
	{ method: 'GET', route: '/api/v1/projects/[id]/board', action: 'rail.read', prepare: async () => ({ path: `/api/v1/projects/${projectId}/board` }) },
	{ method: 'GET', route: '/api/v1/rails', action: 'rail.read', prepare: async () => ({ path: `/api/v1/rails?workspace=${ws()}` }) },
	{ method: 'GET', route: '/api/v1/rails/[id]', action: 'rail.read', prepare: async () => ({ path: `/api/v1/rails/${railId}` }) },
	{ method: 'GET', route: '/api/v1/rails/[id]/screen', action: 'rail.read', prepare: async () => ({ path: `/api/v1/rails/${railId}/screen` }) },
	{ method: 'PATCH', route: '/api/v1/rails/[id]', action: 'rail.update', prepare: async () => ({ path: `/api/v1/rails/${railId}`, body: { notes: unique('n') } }) },
	{ method: 'DELETE', route: '/api/v1/rails/[id]', action: 'rail.delete', prepare: async () => ({ path: `/api/v1/rails/${await freshRail()}` }) },
	{ method: 'DELETE', route: '/api/v1/rails/[id]/verdict-flag', action: 'rail.update', prepare: async () => ({ path: `/api/v1/rails/${railId}/verdict-flag` }) },
	{ method: 'GET', route: '/api/v1/rails/[id]/loops', action: 'loop.read', prepare: async () => ({ path: `/api/v1/rails/${railId}/loops` }) },
	{
		method: 'POST',
		route: '/api/v1/rails/[id]/loops',
		action: 'loop.save',
		prepare: async () => ({ path: `/api/v1/rails/${await freshRail()}/loops`, body: { baseRevision: null, design: buckDesign(), message: 'try' } })
	},
	{ method: 'GET', route: '/api/v1/loops/[id]', action: 'loop.read', prepare: async () => ({ path: `/api/v1/loops/${loopId}` }) },
	{
		method: 'POST',
		route: '/api/v1/loops/[id]/review',
		action: 'loop.requestReview',
		prepare: async () => ({ path: `/api/v1/loops/${await loopInStatus('draft')}/review`, body: { action: 'request-review' } })
	},
	{
		method: 'POST',
		route: '/api/v1/loops/[id]/review',
		action: 'loop.approve',
		prepare: async () => ({ path: `/api/v1/loops/${await loopInStatus('in-review')}/review`, body: { action: 'approve', comment: 'margins fine at all corners' } })
	},
	{
		method: 'POST',
		route: '/api/v1/loops/[id]/review',
		action: 'loop.requestChanges',
		prepare: async () => ({ path: `/api/v1/loops/${await loopInStatus('in-review')}/review`, body: { action: 'request-changes', comment: 'raise the PM at Vin max' } })
	},
	{ method: 'GET', route: '/api/v1/loops/[id]/review', action: 'loop.read', prepare: async () => ({ path: `/api/v1/loops/${loopId}/review` }) },
	{ method: 'GET', route: '/api/v1/loops/[id]/report', action: 'loop.read', prepare: async () => ({ path: `/api/v1/loops/${loopId}/report` }) },
	{ method: 'GET', route: '/api/v1/loops/[id]/switching-check', action: 'loop.read', prepare: async () => ({ path: `/api/v1/loops/${loopId}/switching-check` }) },
	// One frequency (fsw/10 of the 500 kHz test buck) keeps the run short; repeats are answered from storage.
	{ method: 'POST', route: '/api/v1/loops/[id]/switching-check', action: 'loop.check', prepare: async () => ({ path: `/api/v1/loops/${loopId}/switching-check`, body: { freqHz: [50_000] } }) },
	{ method: 'GET', route: '/api/v1/loops/[id]/exports/[format]', action: 'loop.read', prepare: async () => ({ path: `/api/v1/loops/${loopId}/exports/json` }) },
	{ method: 'POST', route: '/api/v1/loops/[id]/template', action: 'template.create', prepare: async () => ({ path: `/api/v1/loops/${loopId}/template`, body: { name: unique('from-loop') } }) },
	{ method: 'GET', route: '/api/v1/reviews', action: 'loop.read', prepare: async () => ({ path: `/api/v1/reviews?workspace=${ws()}` }) },
	{
		method: 'POST',
		route: '/api/v1/rails/[id]/import',
		action: 'loop.save',
		prepare: async () => ({ path: `/api/v1/rails/${await freshRail()}/import`, body: { document: buckDesign(), baseRevision: null } })
	},
	{ method: 'GET', route: '/api/v1/rails/[id]/bench', action: 'rail.read', prepare: async () => ({ path: `/api/v1/rails/${railId}/bench` }) },
	{
		method: 'POST',
		route: '/api/v1/rails/[id]/bench',
		action: 'bench.upload',
		prepare: async () => ({ path: `/api/v1/rails/${railId}/bench`, body: { fileName: 'try.csv', text: BENCH_CSV, metadata: {} } })
	},
	{
		method: 'POST',
		route: '/api/v1/rails/[id]/bench/[benchId]/fit',
		action: 'rail.read',
		prepare: async () => ({ path: `/api/v1/rails/${railId}/bench/${await freshBench(FIT_CSV)}/fit`, body: { parameters: [{ name: 'vramp' }], maxIterations: 3 } })
	},
	{ method: 'GET', route: '/api/v1/bench/[id]', action: 'rail.read', prepare: async () => ({ path: `/api/v1/bench/${await freshBench()}` }) },
	{ method: 'DELETE', route: '/api/v1/bench/[id]', action: 'bench.upload', prepare: async () => ({ path: `/api/v1/bench/${await freshBench()}` }) },
	{ method: 'GET', route: '/api/v1/loops/[id]/comments', action: 'loop.read', prepare: async () => ({ path: `/api/v1/loops/${loopId}/comments` }) },
	{ method: 'POST', route: '/api/v1/loops/[id]/comments', action: 'loop.comment', prepare: async () => ({ path: `/api/v1/loops/${loopId}/comments`, body: { body: 'check Vin max' } }) },
	{ method: 'GET', route: '/api/v1/templates', action: 'template.read', prepare: async () => ({ path: `/api/v1/templates?workspace=${ws()}` }) },
	{
		method: 'POST',
		route: '/api/v1/templates',
		action: 'template.create',
		prepare: async () => ({ path: `/api/v1/templates?workspace=${ws()}`, body: { name: unique('tpl'), compensator: { kind: 'type3', target: { method: 'k-factor', phaseMarginDeg: 55 } } } })
	},
	{ method: 'GET', route: '/api/v1/templates/[id]', action: 'template.read', prepare: async () => ({ path: `/api/v1/templates/${templateId}` }) },
	{
		method: 'PATCH',
		route: '/api/v1/templates/[id]',
		action: 'template.update',
		// An edit names the version it was made on (optimistic concurrency).
		prepare: async () => ({ path: `/api/v1/templates/${templateId}`, body: { description: unique('d'), baseUpdatedAt: (await owner().get(`/api/v1/templates/${templateId}`)).body.updatedAt } })
	},
	{
		method: 'DELETE',
		route: '/api/v1/templates/[id]',
		action: 'template.delete',
		prepare: async () => ({
			path: `/api/v1/templates/${(await owner().post(`/api/v1/templates?workspace=${ws()}`, { name: unique('tpl'), compensator: { kind: 'type2' } })).body.id}`
		})
	},
	{ method: 'POST', route: '/api/v1/templates/[id]/apply', action: 'rail.read', prepare: async () => ({ path: `/api/v1/templates/${templateId}/apply`, body: { railId } }) },
	{
		method: 'POST',
		route: '/api/v1/templates/[id]/apply',
		action: 'loop.save',
		prepare: async () => ({ path: `/api/v1/templates/${templateId}/apply`, body: { railId: await freshRail(), save: true } })
	},
	{ method: 'GET', route: '/api/v1/templates/[id]/rails', action: 'template.read', prepare: async () => ({ path: `/api/v1/templates/${templateId}/rails` }) },
	{ method: 'GET', route: '/api/v1/audit', action: 'audit.read', prepare: async () => ({ path: `/api/v1/audit?workspace=${ws()}` }) },
	{ method: 'GET', route: '/api/v1/workspaces/[id]/tokens', action: 'token.manage', prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/tokens` }) },
	{
		method: 'DELETE',
		route: '/api/v1/workspaces/[id]/tokens/[tokenId]',
		action: 'token.manage',
		prepare: async () => ({ path: `/api/v1/workspaces/${ws()}/tokens/${(await team.as.engineer.post('/api/v1/tokens', { name: unique('ci'), workspaceId: ws() })).body.id}` })
	},
	{ method: 'GET', route: '/api/v1/home', action: 'loop.read', prepare: async () => ({ path: `/api/v1/home?workspace=${ws()}` }) }
];

/** Routes that need only a signed-in caller (no workspace role): personal or stateless. */
const personal: { method: RouteCase['method']; route: string; path: () => string; body?: () => unknown }[] = [
	{ method: 'GET', route: '/api/v1/me', path: () => '/api/v1/me' },
	{ method: 'GET', route: '/api/v1/workspaces', path: () => '/api/v1/workspaces' },
	{ method: 'POST', route: '/api/v1/workspaces', path: () => '/api/v1/workspaces', body: () => ({ name: 'Side project', slug: unique('side') }) },
	{ method: 'GET', route: '/api/v1/tokens', path: () => '/api/v1/tokens' },
	{ method: 'POST', route: '/api/v1/tokens', path: () => '/api/v1/tokens', body: () => ({ name: 'ci' }) },
	{ method: 'POST', route: '/api/v1/analyze', path: () => '/api/v1/analyze', body: () => buckDesign() },
	{ method: 'PATCH', route: '/api/v1/me', path: () => '/api/v1/me', body: () => ({ name: 'Matrix member' }) }
];
/** Personal routes whose id must belong to the caller; checked in their own test. */
const personalWithId = ['DELETE /api/v1/tokens/[id]'];
/** Personal routes with their own tests (admin-api.test.ts): a password change, and a script's first token from e-mail and password. */
const personalOwnTests = ['POST /api/v1/me/password', 'POST /api/v1/tokens/sign-in'];
/** Needs no caller at all: it describes the API, never data. */
const publicRoutes = ['GET /api/v1/openapi.json'];

describe('role × route matrix', () => {
	for (const c of cases) {
		it(`${c.method} ${c.route} (${c.action}) follows the table for every role`, async () => {
			for (const role of ROLES) {
				const { path, body } = await c.prepare();
				const reply = await team.as[role as Role].request(c.method, path, body);
				const expected = can(role, c.action);
				if (expected) expect(reply.status, `${role} should be allowed: ${JSON.stringify(reply.body)}`).toBeLessThan(300);
				else {
					expect(reply.status, `${role} should be refused`).toBe(403);
					expect(reply.body.error.code).toBe('forbidden');
				}
			}
		});
	}

	it('answers 401 to a signed-out caller on every route', async () => {
		const anonymous = new Client(app.origin);
		for (const c of cases) {
			const { path, body } = await c.prepare();
			const reply = await anonymous.request(c.method, path, body);
			expect(reply.status, `${c.method} ${path}`).toBe(401);
		}
		for (const p of personal) {
			expect((await anonymous.request(p.method, p.path(), p.body?.())).status, p.route).toBe(401);
		}
	});

	it('serves personal routes to any signed-in role', async () => {
		for (const role of ROLES) {
			for (const p of personal) {
				const reply = await team.as[role as Role].request(p.method, p.path(), p.body?.());
				expect(reply.status, `${role} ${p.method} ${p.route}: ${JSON.stringify(reply.body).slice(0, 200)}`).toBeLessThan(300);
			}
		}
	});

	it('has a row for every handler in src/routes/api/v1', () => {
		const root = 'src/routes';
		const found: string[] = [];
		const walk = (dir: string) => {
			for (const name of readdirSync(dir)) {
				const full = join(dir, name);
				if (statSync(full).isDirectory()) walk(full);
				else if (name === '+server.ts') {
					const route = '/' + relative(root, dir).split('\\').join('/');
					for (const m of readFileSync(full, 'utf8').matchAll(/export const (GET|POST|PATCH|PUT|DELETE)\b/g)) found.push(`${m[1]} ${route}`);
				}
			}
		};
		walk(join(root, 'api', 'v1'));
		const covered = new Set([...cases.map((c) => `${c.method} ${c.route}`), ...personal.map((p) => `${p.method} ${p.route}`), ...personalWithId, ...personalOwnTests, ...publicRoutes]);
		expect(found.filter((r) => !covered.has(r))).toEqual([]);
		expect(found.length).toBeGreaterThan(25);
		// The OpenAPI document lists every handler except itself.
		const documented = new Set(documentedRoutes());
		expect(found.filter((r) => !documented.has(r) && !publicRoutes.includes(r))).toEqual([]);
	});

	it('serves the OpenAPI document to anyone, with the roles from the table', async () => {
		const reply = await new Client(app.origin).get('/api/v1/openapi.json');
		expect(reply.status).toBe(200);
		expect(reply.body.openapi).toBe('3.1.0');
		const approve = reply.body.paths['/api/v1/loops/{id}/review'].post;
		expect(approve.description).toContain('`loop.approve`: owner, reviewer');
		expect(reply.body.paths['/api/v1/projects/{id}/rails'].post.requestBody.content['application/json'].schema.properties.name.pattern).toBe('^[A-Z0-9][A-Z0-9_]{0,63}$');
	});
});
