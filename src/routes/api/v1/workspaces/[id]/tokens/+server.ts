// GET /api/v1/workspaces/{id}/tokens: the API tokens bound to this workspace, whoever's they are
// (owners: they can see what acts in their workspace and revoke it). Never the secrets.
import { db } from '$lib/server/db';
import { authorize } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as tokens from '$lib/server/services/tokens';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'token.manage', 'workspace');
	return { items: await tokens.listForWorkspace(db, access.workspaceId) };
});
