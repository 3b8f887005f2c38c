// GET /api/v1/loops/{id}/switching-check: the switching check kept with the revision (null when
// none was run). POST { freqHz? }: run it on the stored design in the analysis pool and keep it
// with the revision (owner, engineer, reviewer); a kept check of the current engine and the same
// frequencies is answered as it is.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { switchingCheckRequestSchema } from '$lib/schemas/signoff';
import * as loops from '$lib/server/services/loops';
import * as switchingChecks from '$lib/server/services/switching-check';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	return { switchingCheck: row.switchingCheck ?? null };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.check', 'loop');
	const request = await parseBody(event, switchingCheckRequestSchema);
	const { check, reused } = await switchingChecks.run(db, access.caller, row, request);
	return { switchingCheck: check, reused };
});
