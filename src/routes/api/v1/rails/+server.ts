// GET /api/v1/rails?workspace=: every rail of the workspace with its board's name (id, name,
// topology, fsw, projectId, projectName), by board then rail name; paged, up to
// WORKSPACE_RAILS_MAX per page. Any member (rail.read).
import { z } from 'zod';
import { db } from '$lib/server/db';
import { authorize, requestedWorkspaceId } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { parseQuery } from '$lib/server/http/request';
import * as rails from '$lib/server/services/rails';
import type { RequestHandler } from './$types';

const railListQuery = z.object({
	limit: z.coerce.number().int().min(1).max(rails.WORKSPACE_RAILS_MAX).default(200),
	offset: z.coerce.number().int().min(0).default(0)
});

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'rail.read', 'workspace');
	return rails.listInWorkspace(db, access.workspaceId, parseQuery(event, railListQuery));
});
