// GET /api/v1/templates?workspace=: the workspace's compensator strategies, paged.
// POST: add one (owner, engineer).
import { db } from '$lib/server/db';
import { authorize, requestedWorkspaceId } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseBody, parseQuery } from '$lib/server/http/request';
import { templateSchema } from '$lib/schemas/workspace';
import * as templates from '$lib/server/services/templates';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'template.read', 'workspace');
	return templates.list(db, access.workspaceId, parseQuery(event, pageQuery));
});

export const POST: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'template.create', 'workspace');
	const input = await parseBody(event, templateSchema);
	return created(await templates.create(db, access.caller, access.workspaceId, input));
});
