// POST /api/v1/tokens/sign-in: a script-only user's first token. The body carries e-mail and
// password with the token's fields; the password is checked by better-auth's own sign-in (the
// same per-address and per-account failure limits, the same "confirm your address first" rule),
// the session that sign-in opens is ended at once, and the answer is the new token, shown once.
// Not a way around the session rule of POST /api/v1/tokens: it proves the password, which a
// token never carries, so a leaked token still cannot mint more.
import { eq } from 'drizzle-orm';
import { APIError } from 'better-auth/api';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { session } from '$lib/server/db/schema';
import { created, endpoint } from '$lib/server/http/endpoint';
import { ApiError } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { tokenSignInSchema } from '$lib/schemas/auth';
import { tokenCreateSchema } from '$lib/schemas/workspace';
import { tokenWorkspace } from '$lib/server/services/token-workspace';
import * as tokens from '$lib/server/services/tokens';
import type { RequestHandler } from './$types';

const bodySchema = tokenCreateSchema.extend(tokenSignInSchema.shape);

/** better-auth's refusal as our API error: wrong password 401, unconfirmed address 403, throttled 429 with its wait. */
function signInRefused(error: APIError): ApiError {
	const body = (error.body ?? {}) as { code?: string; message?: string };
	const retry = Number(error.headers instanceof Headers ? error.headers.get('retry-after') : NaN);
	if (error.statusCode === 429) return new ApiError(429, 'too-many-attempts', body.message ?? 'too many sign-in attempts', undefined, Number.isFinite(retry) ? { retryAfterS: retry } : undefined);
	if (body.code === 'EMAIL_NOT_VERIFIED') return new ApiError(403, 'email-not-confirmed', 'confirm your e-mail address first: a new link is on its way', { email: 'not confirmed yet' });
	if (error.statusCode === 401) return new ApiError(401, 'invalid-credentials', 'that e-mail and password do not match an account', { password: 'does not match' });
	return new ApiError(error.statusCode >= 500 ? 500 : error.statusCode, 'sign-in-failed', body.message ?? error.message);
}

export const POST: RequestHandler = endpoint(async (event) => {
	const { email, password, ...input } = await parseBody(event, bodySchema);
	let signedIn: { token: string; user: { id: string } };
	try {
		signedIn = await auth.api.signInEmail({ body: { email, password }, headers: event.request.headers });
	} catch (error) {
		if (error instanceof APIError) throw signInRefused(error);
		throw error;
	}
	// The script wanted a token, not a browser session: end the one sign-in opened, and drop its cookies from this answer.
	await db.delete(session).where(eq(session.token, signedIn.token));
	const context = await auth.$context;
	for (const cookie of Object.values(context.authCookies)) event.cookies.delete(cookie.name, { path: '/' });
	const workspace = await tokenWorkspace(db, signedIn.user.id, input.workspaceId);
	return created(await tokens.create(db, signedIn.user.id, { ...input, workspace }));
});
