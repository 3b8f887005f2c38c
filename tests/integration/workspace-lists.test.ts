// The lists the templates page reads through /api/v1: templates with a search (`q` in the name,
// description, topology or network kind, case-insensitive, `%` and `_` taken literally) and the
// rails using each, and every rail of the workspace with its board's name. Any member reads
// them; a stranger's workspace answers 404.
import './support/env';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES } from '../../src/lib/authz';
import { servedApp } from './support/app';
import { buckDesign } from './support/designs';
import { buildTeam, railBody, testDb, type Team } from './support/fixtures';

const app = servedApp();
const { pool, db } = testDb();
let team: Team;
const ids: Record<string, string> = {};

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	const ws = team.workspaceId;
	for (const name of ['Zeta board', 'Alpha board']) ids[name] = (await team.as.owner.post(`/api/v1/projects?workspace=${ws}`, { name })).body.id;
	for (const [board, rail] of [['Zeta board', 'A_RAIL'], ['Alpha board', 'Z_RAIL'], ['Alpha board', 'B_RAIL']]) {
		const reply = await team.as.engineer.post(`/api/v1/projects/${ids[board]}/rails`, railBody(rail));
		expect(reply.status).toBe(201);
		ids[rail] = reply.body.id;
	}
	const make = async (name: string, description: string | null, kind: string) => {
		const reply = await team.as.engineer.post(`/api/v1/templates?workspace=${ws}`, { name, description, compensator: { kind, target: { method: 'k-factor', phaseMarginDeg: 55 } } });
		expect(reply.status, JSON.stringify(reply.body)).toBe(201);
		ids[name] = reply.body.id;
	};
	await make('Fast buck', 'High crossover for 100% load steps', 'type3');
	await make('Slow boost', null, 'type2');
	await make('Plain_name', 'nothing special', 'type3');
	// B_RAIL's latest revision is placed from "Fast buck".
	const saved = await team.as.engineer.post(`/api/v1/rails/${ids.B_RAIL}/loops`, { baseRevision: null, design: buckDesign(), message: 'first' });
	expect(saved.status, saved.body?.error?.message).toBe(201);
	const applied = await team.as.engineer.post(`/api/v1/templates/${ids['Fast buck']}/apply`, { railId: ids.B_RAIL, save: true });
	expect(applied.status, applied.body?.error?.message).toBe(201);
});
afterAll(async () => {
	await pool.end();
});

const names = (items: { name: string }[]) => items.map((t) => t.name);

describe('GET /api/v1/templates', () => {
	it('lists every template by name with the rails whose latest revision uses it', async () => {
		const reply = await team.as.viewer.get(`/api/v1/templates?workspace=${team.workspaceId}`);
		expect(reply.status).toBe(200);
		expect(names(reply.body.items)).toEqual(['Fast buck', 'Plain_name', 'Slow boost']);
		expect(reply.body.page.total).toBe(3);
		const fast = reply.body.items.find((t: { name: string }) => t.name === 'Fast buck');
		expect(fast.rails).toEqual([expect.objectContaining({ railId: ids.B_RAIL, railName: 'B_RAIL', projectId: ids['Alpha board'], revision: 2 })]);
		expect(reply.body.items.find((t: { name: string }) => t.name === 'Slow boost').rails).toEqual([]);
	});

	it('finds by name, description or network kind whatever the case, and reads % and _ literally', async () => {
		const found = async (q: string) => names((await team.as.viewer.get(`/api/v1/templates?workspace=${team.workspaceId}&q=${encodeURIComponent(q)}`)).body.items);
		expect(await found('BOOST')).toEqual(['Slow boost']);
		expect(await found('crossover')).toEqual(['Fast buck']);
		expect(await found('type3')).toEqual(['Fast buck', 'Plain_name']);
		expect(await found('100%')).toEqual(['Fast buck']);
		expect(await found('%')).toEqual(['Fast buck']);
		expect(await found('_')).toEqual(['Plain_name']);
		expect(await found('no such thing')).toEqual([]);
	});

	it('refuses a search longer than 200 characters, naming the field', async () => {
		const reply = await team.as.viewer.get(`/api/v1/templates?workspace=${team.workspaceId}&q=${'x'.repeat(201)}`);
		expect(reply.status).toBe(400);
		expect(Object.keys(reply.body.error.fields)).toEqual(['q']);
	});
});

describe('GET /api/v1/rails', () => {
	it('lists every rail of the workspace with its board, by board then rail name, to every role', async () => {
		for (const role of ROLES) {
			const reply = await team.as[role].get(`/api/v1/rails?workspace=${team.workspaceId}`);
			expect(reply.status, role).toBe(200);
			expect(reply.body.items.map((r: { projectName: string; name: string }) => `${r.projectName}/${r.name}`)).toEqual(['Alpha board/B_RAIL', 'Alpha board/Z_RAIL', 'Zeta board/A_RAIL']);
			expect(reply.body.items[0]).toEqual({ id: ids.B_RAIL, name: 'B_RAIL', topology: 'buck', fsw: 500_000, projectId: ids['Alpha board'], projectName: 'Alpha board' });
		}
	});

	it("answers 404 for another workspace's rails and 400 for a page beyond the bound", async () => {
		expect((await team.outsider.get(`/api/v1/rails?workspace=${team.workspaceId}`)).status).toBe(404);
		const tooMany = await team.as.viewer.get(`/api/v1/rails?workspace=${team.workspaceId}&limit=1001`);
		expect(tooMany.status).toBe(400);
		expect(Object.keys(tooMany.body.error.fields)).toEqual(['limit']);
	});
});
