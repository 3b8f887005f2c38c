// GET /api/v1/projects/{id}/rails: the board's rails with corners and latest revision, paged.
// POST: add a rail (owner, engineer).
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseBody, parseQuery } from '$lib/server/http/request';
import { railCreateSchema } from '$lib/schemas/workspace';
import * as projects from '$lib/server/services/projects';
import * as rails from '$lib/server/services/rails';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row: project } = await authorizeRow(event, await projects.get(db, event.params.id), 'rail.read', 'project');
	const page = await rails.list(db, project.id, parseQuery(event, pageQuery));
	const targets = await workspaces.marginTargets(db, project.workspaceId);
	return { ...page, items: page.items.map((r) => rails.present(r.rail, targets, r.latestRevision)) };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const { row: project, access } = await authorizeRow(event, await projects.get(db, event.params.id), 'rail.create', 'project');
	const input = await parseBody(event, railCreateSchema);
	const rail = await rails.create(db, access.caller, project, input);
	return created(rails.present(rail, await workspaces.marginTargets(db, project.workspaceId)));
});
