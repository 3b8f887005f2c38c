// Request pipeline: security headers on every answer, record the client address, identify the caller (better-auth session
// cookie, or an API token on /api/v1), then guard the request (body size, signed-in areas,
// development-only pages). Every endpoint still checks the caller's role itself through
// $lib/server/authz/guard.
import { building } from '$app/environment';
import { isRedirect, redirect, type Handle } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { svelteKitHandler } from 'better-auth/svelte-kit';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { isProduction } from '$lib/server/env';
import { errorResponse, ApiError, databaseUnavailable, isDatabaseUnavailable } from '$lib/server/http/errors';
import { databaseAnswers } from '$lib/server/health';
import { MAX_BODY_BYTES } from '$lib/server/http/request';
import { withSecurityHeaders } from '$lib/server/http/securityHeaders';
import { BENCH_MAX_BYTES } from '$lib/bench';
import * as tokens from '$lib/server/services/tokens';
import { CLIENT_IP_HEADER } from '$lib/server/sign-in-throttle';
import { signInPath } from '$lib/safeRedirect';

/**
 * The client address better-auth's limiter and our sign-in throttle key on, always overwritten:
 * a value sent by the client is never trusted. getClientAddress() is the socket's peer, or the
 * address adapter-node reads from ADDRESS_HEADER / XFF_DEPTH behind a reverse proxy (README).
 */
const clientAddress: Handle = async ({ event, resolve }) => {
	let address = '';
	try {
		address = event.getClientAddress();
	} catch {
		// No address (prerendering, or adapter-node's ADDRESS_HEADER missing from the request): the
		// header is removed and such requests share one count, the strict side.
	}
	if (address) event.request.headers.set(CLIENT_IP_HEADER, address);
	else event.request.headers.delete(CLIENT_IP_HEADER);
	return resolve(event);
};

const identify: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.session = null;
	event.locals.authenticatedBy = null;
	const bearer = /^Bearer\s+(\S+)$/i.exec(event.request.headers.get('authorization') ?? '')?.[1];
	try {
		if (bearer && event.url.pathname.startsWith('/api/v1/')) {
			const user = await tokens.authenticate(db, bearer);
			if (user) {
				event.locals.user = user;
				event.locals.authenticatedBy = 'token';
			}
		} else if (!building) {
			const found = await auth.api.getSession({ headers: event.request.headers });
			if (found) {
				event.locals.user = found.user;
				event.locals.session = found.session;
				event.locals.authenticatedBy = 'session';
			}
		}
	} catch (error) {
		// Database down: answer 503 at once rather than a 500 (better-auth hides the cause, so ask the database).
		if (isDatabaseUnavailable(error) || !(await databaseAnswers(db, 1000))) {
			if (event.url.pathname.startsWith('/api/')) return errorResponse(databaseUnavailable());
			return new Response('Loopwright cannot reach its database right now; try again in a few seconds.', { status: 503, headers: { 'content-type': 'text/plain; charset=utf-8', 'retry-after': '5' } });
		}
		throw error;
	}
	return svelteKitHandler({ event, resolve, auth, building });
};

/** Bench uploads may carry a whole analyzer file (the route checks the exact 5 MB rule itself,
 * multipart framing included); every other API body is a JSON document of at most 1 MB. */
function bodyLimitFor(path: string): number {
	return /^\/api\/v1\/rails\/[^/]+\/bench\/?$/.test(path) ? Math.ceil(BENCH_MAX_BYTES * 1.25) : MAX_BODY_BYTES;
}

/** Page trees only signed-in users may open (their loads check again). */
const SIGNED_IN_AREAS = ['/w', '/app'];

const guard: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	const limit = bodyLimitFor(path);
	if (path.startsWith('/api/v1/') && Number(event.request.headers.get('content-length') ?? 0) > limit) {
		const response = errorResponse(new ApiError(413, 'payload-too-large', `the body exceeds ${limit} bytes`));
		// The unread body is still on the socket: close it rather than let the client reuse it.
		response.headers.set('connection', 'close');
		return response;
	}
	if (SIGNED_IN_AREAS.some((area) => path === area || path.startsWith(`${area}/`)) && !event.locals.user) {
		redirect(303, signInPath(path + event.url.search));
	}
	if ((path === '/dev' || path.startsWith('/dev/')) && isProduction()) {
		return new Response('Not found', { status: 404 });
	}
	return resolve(event);
};

/** First in the chain, so better-auth's answers, the early 503s and redirects thrown by a hook get the headers too. */
const securityHeaders: Handle = async ({ event, resolve }) => {
	try {
		return withSecurityHeaders(await resolve(event));
	} catch (error) {
		if (isRedirect(error)) return withSecurityHeaders(new Response(null, { status: error.status, headers: { location: error.location } }));
		throw error;
	}
};

export const handle = sequence(securityHeaders, clientAddress, identify, guard);
