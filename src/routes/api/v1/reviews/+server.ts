// GET /api/v1/reviews?workspace=: the caller's review queue: revisions they were asked to
// sign off (open first, then their answers) and every other revision waiting in review.
import { db } from '$lib/server/db';
import { authorize, requestedWorkspaceId } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as reviews from '$lib/server/services/reviews';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const workspaceId = await requestedWorkspaceId(event);
	const { caller } = await authorize(event, workspaceId, 'loop.read', 'workspace');
	return reviews.queue(db, workspaceId, caller.userId);
});
