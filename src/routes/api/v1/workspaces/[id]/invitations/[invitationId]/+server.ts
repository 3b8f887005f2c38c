// DELETE /api/v1/workspaces/{id}/invitations/{invitationId}: cancel a pending invitation (owner).
import { db } from '$lib/server/db';
import { authorize } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import * as invitations from '$lib/server/services/invitations';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'member.invite', 'workspace');
	const row = await invitations.get(db, access.workspaceId, event.params.invitationId);
	if (!row) throw notFound('invitation');
	await invitations.cancel(db, access.caller, row);
	return noContent();
});
