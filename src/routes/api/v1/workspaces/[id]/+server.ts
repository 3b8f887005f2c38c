// GET /api/v1/workspaces/{id}: name, slug, the caller's role and the default margin targets.
// PATCH: rename or change the default margin targets (owner).
import { db } from '$lib/server/db';
import { authorize } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { workspaceUpdateSchema } from '$lib/schemas/workspace';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'workspace.read', 'workspace');
	const workspace = await workspaces.get(db, access.workspaceId);
	if (!workspace) throw notFound('workspace');
	return { ...workspace, role: access.role, marginTargets: await workspaces.marginTargets(db, workspace.id) };
});

export const PATCH: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, event.params.id, 'workspace.update', 'workspace');
	const patch = await parseBody(event, workspaceUpdateSchema);
	const workspace = await workspaces.get(db, access.workspaceId);
	if (!workspace) throw notFound('workspace');
	const updated = await workspaces.update(db, access.caller, workspace, patch);
	return { ...updated, role: access.role, marginTargets: await workspaces.marginTargets(db, workspace.id) };
});
