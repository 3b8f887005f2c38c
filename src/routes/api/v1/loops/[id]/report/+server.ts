// GET /api/v1/loops/{id}/report: what the review page shows, computed on the server: margins
// at every corner against the targets in force (with verdicts), the step responses, a small
// seeded Monte Carlo yield, the review trail, comments, requests, and the parameter diff to
// the rail's last approved revision.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as loops from '$lib/server/services/loops';
import * as signoff from '$lib/server/services/signoff';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	return signoff.reviewView(db, row, access.caller.userId);
});
