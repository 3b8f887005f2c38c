// GET /api/v1/rails/{id}/loops: the rail's revisions, newest first (metrics, no design), paged.
// POST { baseRevision, design, message }: append the next revision (owner, engineer); a stale
// baseRevision answers 409 with the current revision. A saved revision's PDF and plot files are
// pre-rendered in the background (services/export-prerender.ts).
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseBody, parseQuery } from '$lib/server/http/request';
import { loopSaveSchema } from '$lib/schemas/workspace';
import * as loops from '$lib/server/services/loops';
import * as rails from '$lib/server/services/rails';
import { prerenderExports } from '$lib/server/services/export-prerender';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row: rail } = await authorizeRow(event, await rails.get(db, event.params.id), 'loop.read', 'rail');
	return loops.list(db, rail.id, parseQuery(event, pageQuery));
});

export const POST: RequestHandler = endpoint(async (event) => {
	const { row: rail, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'loop.save', 'rail');
	const input = await parseBody(event, loopSaveSchema);
	const row = await loops.save(db, access.caller, rail, input);
	// The first PDF and PNG of the revision are drawn in the background, not on this answer's path.
	prerenderExports(db, row.id, access.caller.userId);
	return created(row);
});
