// GET /api/v1/workspaces/{id}/invitations: invitations and their status (owners only: the list
// names invited addresses and, while one is pending, whom a sign-up with that address would join).
// POST: invite an e-mail address with one of our four roles (owner); the link goes by e-mail.
import { db } from '$lib/server/db';
import { appOrigin } from '$lib/server/auth-core';
import { authorize } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { invitationSchema } from '$lib/schemas/workspace';
import * as invitations from '$lib/server/services/invitations';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'member.invite', 'workspace');
	return { items: await invitations.list(db, access.workspaceId) };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'member.invite', 'workspace');
	const input = await parseBody(event, invitationSchema);
	const workspace = await workspaces.get(db, access.workspaceId);
	if (!workspace) throw notFound('workspace');
	const row = await invitations.invite(db, access.caller, workspace, input, appOrigin());
	return created({ id: row.id, email: row.email, role: row.role, status: row.status, expiresAt: row.expiresAt });
});
