// DELETE /api/v1/tokens/{id}: revoke one of the caller's tokens (404 for anyone else's).
import { db } from '$lib/server/db';
import { requireCaller } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import * as tokens from '$lib/server/services/tokens';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	if (!(await tokens.revoke(db, caller.userId, event.params.id))) throw notFound('token');
	return noContent();
});
