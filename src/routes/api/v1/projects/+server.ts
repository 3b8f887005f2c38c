// GET /api/v1/projects?workspace=&limit=&offset=: the workspace's projects (boards), paged.
// POST: create one (owner, engineer).
import { db } from '$lib/server/db';
import { authorize, requestedWorkspaceId } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseBody, parseQuery } from '$lib/server/http/request';
import { projectCreateSchema } from '$lib/schemas/workspace';
import * as projects from '$lib/server/services/projects';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'project.read', 'workspace');
	return projects.list(db, access.workspaceId, parseQuery(event, pageQuery));
});

export const POST: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'project.create', 'workspace');
	const input = await parseBody(event, projectCreateSchema);
	return created(await projects.create(db, access.caller, access.workspaceId, input));
});
