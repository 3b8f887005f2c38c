// better-auth serves every endpoint of its own over HTTP under /api/auth. Where Loopwright offers
// the same act through its own throttled endpoint, better-auth's copy is closed: otherwise a stolen
// session could guess the account's password through /api/auth/change-password, which only
// better-auth's coarse per-path limiter sees. The app's own endpoint calls better-auth in-process
// (auth.api.*), which does not pass through this HTTP path.
import { ApiError, errorResponse } from './http/errors';

/** better-auth HTTP paths answered 404, with the Loopwright endpoint that replaces each. */
export const CLOSED_AUTH_PATHS: Record<string, string> = {
	'/api/auth/change-password': 'POST /api/v1/me/password'
};

/** The 404 answer for a closed better-auth path, or null when the path stays open. */
export function closedAuthPathResponse(pathname: string): Response | null {
	const replacement = CLOSED_AUTH_PATHS[pathname.replace(/\/+$/, '').toLowerCase()];
	return replacement ? errorResponse(new ApiError(404, 'not-found', `not available here; use ${replacement}`)) : null;
}
