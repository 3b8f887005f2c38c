// POST /api/v1/loops/{id}/review { action, comment? }: sign-off steps. request-review
// (owner, engineer): draft | changes-requested → in-review. approve / request-changes
// (owner, reviewer): in-review → approved | changes-requested. Others: 422.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import type { Action } from '$lib/server/authz/permissions';
import { endpoint } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { loopReviewSchema } from '$lib/schemas/workspace';
import * as loops from '$lib/server/services/loops';
import type { RequestHandler } from './$types';

const ACTION: Record<loops.ReviewAction, Action> = {
	'request-review': 'loop.requestReview',
	approve: 'loop.approve',
	'request-changes': 'loop.requestChanges'
};

export const POST: RequestHandler = endpoint(async (event) => {
	const loop = await loops.get(db, event.params.id);
	// Read access first, so a stranger gets 404 before the body is even looked at.
	await authorizeRow(event, loop, 'loop.read', 'loop');
	const { action, comment } = await parseBody(event, loopReviewSchema);
	const { row, access } = await authorizeRow(event, loop, ACTION[action], 'loop');
	return loops.review(db, access.caller, row, action, comment);
});
