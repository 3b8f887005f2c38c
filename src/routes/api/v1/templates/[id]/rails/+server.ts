// GET /api/v1/templates/{id}/rails: the rails whose latest revision was placed from this template.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as templates from '$lib/server/services/templates';
import { usage } from '$lib/server/services/template-use';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await templates.get(db, event.params.id), 'template.read', 'template');
	return { items: (await usage(db, row.workspaceId, [row.id]))[row.id] ?? [] };
});
