// The REST API against the real app and MariaDB: happy paths, validation errors, signed-out
// access, cross-workspace isolation and the audit trail.
import './support/env';
import { describe, expect, it } from 'vitest';
import { Client } from './support/client';
import { railBody, servedTeam } from './support/fixtures';

const served = servedTeam();

const q = () => `?workspace=${served.team.workspaceId}`;

describe('projects and rails', () => {
	it('creates, reads, lists, updates and deletes a project with its rails', async () => {
		const eng = served.team.as.engineer;
		const made = await eng.post(`/api/v1/projects${q()}`, { name: 'Motor drive board', description: 'rev B' });
		expect(made.status).toBe(201);
		const id = made.body.id;

		expect((await eng.get(`/api/v1/projects/${id}`)).body.name).toBe('Motor drive board');
		const listed = await eng.get(`/api/v1/projects${q()}&limit=10`);
		expect(listed.status).toBe(200);
		expect(listed.body.items.map((p: { id: string }) => p.id)).toContain(id);
		expect(listed.body.page).toMatchObject({ limit: 10, offset: 0 });

		const renamed = await eng.patch(`/api/v1/projects/${id}`, { name: 'Motor drive board B' });
		expect(renamed.status).toBe(200);
		expect(renamed.body.name).toBe('Motor drive board B');

		const rail = await eng.post(`/api/v1/projects/${id}/rails`, railBody());
		expect(rail.status).toBe(201);
		// The spec a new revision starts from: the rail's operating ranges, its tolerances, the targets in force.
		expect(rail.body.spec.corners).toEqual({ vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } });
		expect(rail.body.spec.tolerances.l).toMatchObject({ tol: 0.2 });
		expect(rail.body.spec.targets).toEqual({ phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 });
		expect(rail.body.effectiveMarginTargets).toEqual({ phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 });

		const rails = await eng.get(`/api/v1/projects/${id}/rails`);
		expect(rails.body.items).toHaveLength(1);

		// Deleting a board is for owners.
		expect((await eng.delete(`/api/v1/projects/${id}`)).status).toBe(403);
		expect((await served.team.as.owner.delete(`/api/v1/projects/${id}`)).status).toBe(204);
		expect((await eng.get(`/api/v1/projects/${id}`)).status).toBe(404);
		expect((await eng.get(`/api/v1/rails/${rail.body.id}`)).status).toBe(404);
	});

	it('answers 400 with field errors for an invalid rail, also after a PATCH that breaks a cross-field rule', async () => {
		const eng = served.team.as.engineer;
		const project = await eng.post(`/api/v1/projects${q()}`, { name: 'Validation board' });
		const bad = await eng.post(`/api/v1/projects/${project.body.id}/rails`, { ...railBody('5v0 main'), vinMin: 4 });
		expect(bad.status).toBe(400);
		expect(bad.body.error.code).toBe('invalid-request');
		expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['name']));

		// A buck steps down: vinMin below vout is refused [fact of the trade].
		const stepUp = await eng.post(`/api/v1/projects/${project.body.id}/rails`, { ...railBody(), vinMin: 4 });
		expect(stepUp.status).toBe(400);
		expect(stepUp.body.error.fields.vinMin).toMatch(/buck/);

		const ok = await eng.post(`/api/v1/projects/${project.body.id}/rails`, railBody('3V3_AUX'));
		const patched = await eng.patch(`/api/v1/rails/${ok.body.id}`, { vinNom: 20 });
		expect(patched.status).toBe(400);
		expect(patched.body.error.fields.vinMax).toBeDefined();

		const dup = await eng.post(`/api/v1/projects/${project.body.id}/rails`, railBody('3V3_AUX'));
		expect(dup.status).toBe(409);
	});

	it('refuses non-JSON bodies, broken JSON and oversized bodies', async () => {
		const eng = served.team.as.engineer;
		const form = await eng.request('POST', `/api/v1/projects${q()}`, 'name=x', { 'content-type': 'text/plain' });
		expect(form.status).toBe(415);
		const broken = await eng.request('POST', `/api/v1/projects${q()}`, '{"name":', {});
		expect(broken.status).toBe(400);
		expect(broken.body.error.code).toBe('invalid-json');
		const huge = await eng.request('POST', `/api/v1/projects${q()}`, JSON.stringify({ name: 'x', description: 'y'.repeat(1_100_000) }));
		expect(huge.status).toBe(413);
	});
});

describe('signed-out and cross-workspace access', () => {
	it('answers 401 with the JSON error shape when signed out', async () => {
		const anonymous = new Client(served.origin);
		for (const path of ['/api/v1/projects', '/api/v1/me', '/api/v1/templates', `/api/v1/workspaces/${served.team.workspaceId}`]) {
			const reply = await anonymous.get(path);
			expect(reply.status, path).toBe(401);
			expect(reply.body.error.code).toBe('unauthorized');
		}
		expect((await anonymous.post(`/api/v1/projects?workspace=${served.team.workspaceId}`, { name: 'x' })).status).toBe(401);
	});

	it("answers 404 for another workspace's ids, exactly as for ids that do not exist", async () => {
		const project = await served.team.as.owner.post(`/api/v1/projects${q()}`, { name: 'Private board' });
		const rail = await served.team.as.owner.post(`/api/v1/projects/${project.body.id}/rails`, railBody('12V_BUS'.replace('12V', '1V8')));
		const stranger = served.team.outsider;
		for (const [method, path] of [
			['GET', `/api/v1/projects/${project.body.id}`],
			['PATCH', `/api/v1/projects/${project.body.id}`],
			['DELETE', `/api/v1/projects/${project.body.id}`],
			['GET', `/api/v1/rails/${rail.body.id}`],
			['GET', `/api/v1/projects/${project.body.id}/rails`],
			['GET', `/api/v1/projects${q()}`],
			['GET', `/api/v1/workspaces/${served.team.workspaceId}/members`],
			['GET', `/api/v1/audit${q()}`]
		]) {
			const reply = await stranger.request(method, path, method === 'PATCH' ? { name: 'mine now' } : undefined);
			expect(reply.status, `${method} ${path}`).toBe(404);
			expect(reply.body.error.code).toBe('not-found');
		}
		const missing = await stranger.get('/api/v1/projects/00000000-0000-0000-0000-000000000000');
		expect(missing.status).toBe(404);
		// Their own workspace still answers, and does not list the other team's boards.
		const own = await stranger.get(`/api/v1/projects?workspace=${served.team.outsiderWorkspaceId}`);
		expect(own.status).toBe(200);
		expect(own.body.items.map((p: { id: string }) => p.id)).not.toContain(project.body.id);
	});
});

describe('audit log', () => {
	it('records who changed what, with before and after', async () => {
		const eng = served.team.as.engineer;
		const project = await eng.post(`/api/v1/projects${q()}`, { name: 'Audited board' });
		await eng.patch(`/api/v1/projects/${project.body.id}`, { name: 'Audited board 2' });
		const trail = await served.team.as.viewer.get(`/api/v1/audit${q()}&entityId=${project.body.id}`);
		expect(trail.status).toBe(200);
		const [update, create] = trail.body.items;
		expect(create).toMatchObject({ action: 'project.create', actorEmail: eng.email, after: { name: 'Audited board' } });
		expect(update).toMatchObject({
			action: 'project.update',
			actorId: eng.userId,
			before: { name: 'Audited board' },
			after: { name: 'Audited board 2' }
		});
	});
});
