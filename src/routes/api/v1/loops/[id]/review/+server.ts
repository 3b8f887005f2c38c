// POST /api/v1/loops/{id}/review { action, comment?, reviewerIds? }: sign-off steps.
// request-review (owner, engineer): draft | changes-requested → in-review; with reviewerIds
// each named owner/reviewer gets a queue entry and an e-mail (a revision already in review
// just gains reviewers). approve / request-changes (owner, reviewer; never the author, 403
// own-revision; request-changes needs a comment): in-review → approved | changes-requested,
// and the author is e-mailed. Other moves: 422.
// GET: who was asked and how they answered, plus who could be asked.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import type { Action } from '$lib/authz';
import { endpoint } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { loopReviewSchema } from '$lib/schemas/workspace';
import * as loops from '$lib/server/services/loops';
import * as reviews from '$lib/server/services/reviews';
import type { RequestHandler } from './$types';

const ACTION: Record<loops.ReviewAction, Action> = {
	'request-review': 'loop.requestReview',
	approve: 'loop.approve',
	'request-changes': 'loop.requestChanges'
};

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	const [requests, candidates] = await Promise.all([reviews.requestsFor(db, row.id), reviews.candidates(db, row.workspaceId, row.authorId)]);
	return { loopId: row.id, status: row.status, authorId: row.authorId, requests, candidates };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const loop = await loops.get(db, event.params.id);
	// Read access first, so a stranger gets 404 before the body is even looked at.
	await authorizeRow(event, loop, 'loop.read', 'loop');
	const { action, comment, reviewerIds } = await parseBody(event, loopReviewSchema);
	const { row, access } = await authorizeRow(event, loop, ACTION[action], 'loop');
	const origin = event.url.origin;
	if (action === 'request-review') {
		if (reviewerIds) return reviews.request(db, access.caller, row, reviewerIds, comment, origin);
		return loops.review(db, access.caller, row, action, comment);
	}
	return reviews.decide(db, access.caller, row, action, comment, origin);
});
