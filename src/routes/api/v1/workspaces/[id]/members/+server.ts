// GET /api/v1/workspaces/{id}/members: members with their roles.
import { db } from '$lib/server/db';
import { authorize } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'member.read', 'workspace');
	return { items: await workspaces.members(db, access.workspaceId) };
});
