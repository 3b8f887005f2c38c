// GET /api/v1/loops/{id}/comments: the review conversation. POST { body }: add a comment
// (owner, engineer, reviewer); `freqHz` pins it to a frequency on the plot.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { commentSchema } from '$lib/schemas/workspace';
import * as loops from '$lib/server/services/loops';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	return { items: await loops.comments(db, row.id) };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.comment', 'loop');
	const { body, freqHz } = await parseBody(event, commentSchema);
	return created(await loops.addComment(db, access.caller, row, body, freqHz ?? null));
});
