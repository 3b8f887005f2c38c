// GET/PATCH/DELETE /api/v1/rails/{id}. Edit and delete: owner, engineer. A PATCH is merged
// with the stored rail and the whole rail re-validated.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { railUpdateSchema } from '$lib/schemas/workspace';
import * as rails from '$lib/server/services/rails';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await rails.get(db, event.params.id), 'rail.read', 'rail');
	return rails.present(row, await workspaces.marginTargets(db, row.workspaceId), await rails.latestRevision(db, row.id));
});

export const PATCH: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'rail.update', 'rail');
	const patch = await parseBody(event, railUpdateSchema);
	const updated = await rails.update(db, access.caller, row, patch);
	return rails.present(updated, await workspaces.marginTargets(db, row.workspaceId), await rails.latestRevision(db, row.id));
});

export const DELETE: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'rail.delete', 'rail');
	await rails.remove(db, access.caller, row);
	return noContent();
});
