// GET /api/v1/loops/{id}/report: what the review page shows. `?part=record` is what the database
// holds (the stored verdict and its figures, the worst corners, the spec, review trail, comments,
// requests, the differences to the previous and the last approved revision) with the caller's
// role; `?part=drawing` is what the analysis pool draws again from the stored design (plot data,
// operating point, closed loop, steps, sensitivity), or its refusal as `analysisError`; without
// `part`, both in one answer. The review page reads the record first and the drawing after.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { parseQuery } from '$lib/server/http/request';
import { reportQuerySchema } from '$lib/schemas/workspace';
import * as loops from '$lib/server/services/loops';
import * as signoff from '$lib/server/services/signoff';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	const { part } = parseQuery(event, reportQuerySchema);
	if (part === 'record') return { ...(await signoff.reviewRecord(db, row)), role: access.role };
	if (part === 'drawing') return signoff.reviewDrawing(row, access.caller.userId);
	return signoff.reviewView(db, row, access.caller.userId);
});
