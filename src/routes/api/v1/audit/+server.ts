// GET /api/v1/audit?workspace=&entityId=&limit=&offset=: the workspace's audit trail, newest first.
import { z } from 'zod';
import { db } from '$lib/server/db';
import { authorize, requestedWorkspaceId } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseQuery } from '$lib/server/http/request';
import * as audit from '$lib/server/services/audit';
import type { RequestHandler } from './$types';

const query = pageQuery.extend({ entityId: z.string().max(36).optional(), workspace: z.string().optional() });

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'audit.read', 'workspace');
	const { entityId, workspace: _w, ...page } = parseQuery(event, query);
	return audit.list(db, access.workspaceId, page, { entityId });
});
