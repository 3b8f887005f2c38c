// POST /api/v1/me/password: change the password from a signed-in session (never with an API token:
// a script must not be able to lock its user out). The current password is checked by better-auth;
// wrong ones count against the same per-account limit as sign-in failures. Every other session of
// the account ends; `revokeTokens` also revokes every API token (when someone else may have known it).
import { APIError } from 'better-auth/api';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { requireCaller } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { ApiError } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { bucketOf, overLimit, RateLimiter } from '$lib/server/rate-limit';
import { SIGN_IN_LIMITS } from '$lib/server/sign-in-throttle';
import { passwordChangeSchema } from '$lib/schemas/auth';
import * as tokens from '$lib/server/services/tokens';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	if (event.locals.authenticatedBy !== 'session') throw new ApiError(403, 'session-required', 'change your password from a signed-in session');
	const input = await parseBody(event, passwordChangeSchema);
	const counter = new RateLimiter(db);
	const bucket = bucketOf('password-change', caller.userId);
	const wait = overLimit(await counter.hit(bucket, SIGN_IN_LIMITS.perAccount), SIGN_IN_LIMITS.perAccount);
	if (wait > 0) throw new ApiError(429, 'too-many-attempts', `too many wrong passwords; try again in ${Math.ceil(wait / 60)} min`, undefined, { retryAfterS: wait });
	try {
		await auth.api.changePassword({
			body: { currentPassword: input.currentPassword, newPassword: input.newPassword, revokeOtherSessions: true },
			headers: event.request.headers
		});
	} catch (error) {
		if (error instanceof APIError) {
			const code = String((error.body as { code?: string } | undefined)?.code ?? '');
			if (code === 'INVALID_PASSWORD') throw new ApiError(400, 'invalid-password', 'the current password is wrong', { currentPassword: 'does not match' });
			await counter.refund(bucket);
			throw new ApiError(error.statusCode >= 500 ? 500 : error.statusCode, 'password-change-failed', (error.body as { message?: string } | undefined)?.message ?? error.message);
		}
		await counter.refund(bucket);
		throw error;
	}
	await counter.clear(bucket);
	const revokedTokens = input.revokeTokens ? await tokens.revokeAll(db, caller.userId) : 0;
	return { changed: true, revokedTokens };
});
