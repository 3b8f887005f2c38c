// GET/PATCH/DELETE /api/v1/projects/{id}. Edit: owner, engineer. Delete (with its rails and
// loops): owner only.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { projectUpdateSchema } from '$lib/schemas/workspace';
import * as projects from '$lib/server/services/projects';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await projects.get(db, event.params.id), 'project.read', 'project');
	return row;
});

export const PATCH: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await projects.get(db, event.params.id), 'project.update', 'project');
	const patch = await parseBody(event, projectUpdateSchema);
	return projects.update(db, access.caller, row, patch);
});

export const DELETE: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await projects.get(db, event.params.id), 'project.delete', 'project');
	await projects.remove(db, access.caller, row);
	return noContent();
});
