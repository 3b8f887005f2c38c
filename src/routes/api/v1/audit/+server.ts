// GET /api/v1/audit?workspace=&entityId=&limit=&offset=: the workspace's audit trail, newest first.
// Invitation entries (the invited address, the id the acceptance link is made of) only for those
// who may invite, the owners: like the pending invitations themselves.
import { z } from 'zod';
import { db } from '$lib/server/db';
import { authorize, requestedWorkspaceId } from '$lib/server/authz/guard';
import { can } from '$lib/authz';
import { endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseQuery } from '$lib/server/http/request';
import * as audit from '$lib/server/services/audit';
import type { RequestHandler } from './$types';

const query = pageQuery.extend({ entityId: z.string().max(36).optional(), workspace: z.string().optional() });

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'audit.read', 'workspace');
	const { entityId, workspace: _w, ...page } = parseQuery(event, query);
	return audit.list(db, access.workspaceId, page, { entityId, withInvitations: can(access.role, 'member.invite') });
});
