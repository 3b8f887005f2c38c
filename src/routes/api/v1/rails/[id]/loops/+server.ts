// GET /api/v1/rails/{id}/loops: the rail's revisions, newest first (metrics, no design), paged.
// POST { baseRevision, design, message }: append the next revision (owner, engineer); a stale
// baseRevision answers 409 with the current revision.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseBody, parseQuery } from '$lib/server/http/request';
import { loopSaveSchema } from '$lib/schemas/workspace';
import * as loops from '$lib/server/services/loops';
import * as rails from '$lib/server/services/rails';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row: rail } = await authorizeRow(event, await rails.get(db, event.params.id), 'loop.read', 'rail');
	return loops.list(db, rail.id, parseQuery(event, pageQuery));
});

export const POST: RequestHandler = endpoint(async (event) => {
	const { row: rail, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'loop.save', 'rail');
	const input = await parseBody(event, loopSaveSchema);
	return created(await loops.save(db, access.caller, rail, input));
});
