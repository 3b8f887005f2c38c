// GET /api/v1/tokens: the caller's API tokens (never the secrets). POST: create one; the secret
// is in the response once. Minting needs a signed-in session (or e-mail and password, ./sign-in),
// never another token: a leaked token cannot outlive its own expiry or revocation by minting more.
import { db } from '$lib/server/db';
import { requireCaller } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { ApiError } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { tokenCreateSchema } from '$lib/schemas/workspace';
import { tokenWorkspace } from '$lib/server/services/token-workspace';
import * as tokens from '$lib/server/services/tokens';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	return { items: await tokens.list(db, caller.userId) };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	if (event.locals.authenticatedBy !== 'session') {
		throw new ApiError(403, 'session-required', 'create API tokens from a signed-in session, or with e-mail and password at POST /api/v1/tokens/sign-in');
	}
	const input = await parseBody(event, tokenCreateSchema);
	const workspace = await tokenWorkspace(db, caller.userId, input.workspaceId);
	return created(await tokens.create(db, caller.userId, { ...input, workspace }));
});
