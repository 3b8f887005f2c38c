// GET /api/v1/loops/{id}: one revision with its full design document and corner metrics.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as loops from '$lib/server/services/loops';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	return row;
});
