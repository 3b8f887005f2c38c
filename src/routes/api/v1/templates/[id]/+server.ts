// GET/PATCH/DELETE /api/v1/templates/{id}. Edit and delete: owner, engineer. A PATCH that
// changes the strategy re-verifies every rail whose latest revision uses the template and
// flags those whose verdict would change (answered as `reverified`).
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { templateUpdateSchema } from '$lib/schemas/workspace';
import * as templates from '$lib/server/services/templates';
import * as templateUse from '$lib/server/services/template-use';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await templates.get(db, event.params.id), 'template.read', 'template');
	return row;
});

export const PATCH: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await templates.get(db, event.params.id), 'template.update', 'template');
	const patch = await parseBody(event, templateUpdateSchema);
	const updated = await templates.update(db, access.caller, row, patch);
	const changed = patch.compensator !== undefined && JSON.stringify(patch.compensator) !== JSON.stringify(row.compensator);
	return { ...updated, reverified: changed ? await templateUse.reverifyUsers(db, updated) : [] };
});

export const DELETE: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await templates.get(db, event.params.id), 'template.delete', 'template');
	await templates.remove(db, access.caller, row);
	return noContent();
});
