// GET /api/v1/workspaces: the caller's workspaces. POST: create one; the caller becomes owner.
// Both need only a signed-in caller: any user may start a workspace of their own.
import { db } from '$lib/server/db';
import { requireCaller } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { workspaceCreateSchema } from '$lib/schemas/workspace';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	return { items: await workspaces.listForUser(db, caller.userId) };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	const input = await parseBody(event, workspaceCreateSchema);
	const workspace = await workspaces.create(db, caller, input);
	return created({ ...workspace, role: 'owner' });
});
