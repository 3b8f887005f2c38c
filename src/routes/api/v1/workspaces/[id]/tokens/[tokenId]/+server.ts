// DELETE /api/v1/workspaces/{id}/tokens/{tokenId}: an owner revokes a token bound to the
// workspace, whoever's it is (404 for a personal token or another workspace's).
import { db } from '$lib/server/db';
import { authorize } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import * as tokens from '$lib/server/services/tokens';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'token.manage', 'workspace');
	if (!(await tokens.revokeInWorkspace(db, access.caller, access.workspaceId, event.params.tokenId))) throw notFound('token');
	return noContent();
});
