// PATCH /api/v1/workspaces/{id}/members/{memberId}: change a member's role (owner).
// DELETE: remove the member (owner). A workspace always keeps one owner (422 otherwise).
import { db } from '$lib/server/db';
import { authorize } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { memberRoleSchema } from '$lib/schemas/workspace';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const PATCH: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'member.updateRole', 'workspace');
	const { role } = await parseBody(event, memberRoleSchema);
	const target = await workspaces.getMember(db, access.workspaceId, event.params.memberId);
	if (!target) throw notFound('member');
	return workspaces.setMemberRole(db, access.caller, target, role);
});

export const DELETE: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'member.remove', 'workspace');
	const target = await workspaces.getMember(db, access.workspaceId, event.params.memberId);
	if (!target) throw notFound('member');
	await workspaces.removeMember(db, access.caller, target);
	return noContent();
});
