// Request pipeline: security headers on every answer, API bodies within their limit, record the client address, identify the caller (better-auth session
// cookie, or an API token on /api/v1), then guard the request (body size, signed-in areas,
// development-only pages). Every endpoint still checks the caller's role itself through
// $lib/server/authz/guard.
import { building } from '$app/environment';
import { isRedirect, redirect, type Handle, type ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { svelteKitHandler } from 'better-auth/svelte-kit';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { isProduction } from '$lib/server/env';
import { errorResponse, databaseUnavailable, isDatabaseUnavailable } from '$lib/server/http/errors';
import { databaseAnswers } from '$lib/server/health';
import { bodyLimitFor, boundedRequest, payloadTooLargeResponse } from '$lib/server/http/bodyLimit';
import { startAnalysisPool } from '$lib/server/analysis-pool';
import { withSecurityHeaders } from '$lib/server/http/securityHeaders';
import * as tokens from '$lib/server/services/tokens';
import { CLIENT_IP_HEADER } from '$lib/server/sign-in-throttle';
import { closedAuthPathResponse } from '$lib/server/closed-auth-paths';
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
	const closed = closedAuthPathResponse(event.url.pathname);
	if (closed) return closed;
	event.locals.user = null;
	event.locals.session = null;
	event.locals.authenticatedBy = null;
	event.locals.tokenWorkspaceId = null;
	const bearer = /^Bearer\s+(\S+)$/i.exec(event.request.headers.get('authorization') ?? '')?.[1];
	try {
		if (bearer && event.url.pathname.startsWith('/api/v1/')) {
			const found = await tokens.authenticate(db, bearer);
			if (found) {
				event.locals.user = found.user;
				event.locals.authenticatedBy = 'token';
				event.locals.tokenWorkspaceId = found.workspaceId;
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

/** Page trees only signed-in users may open (their loads check again). */
const SIGNED_IN_AREAS = ['/w', '/app', '/settings'];

const guard: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	if (SIGNED_IN_AREAS.some((area) => path === area || path.startsWith(`${area}/`)) && !event.locals.user) {
		redirect(303, signInPath(path + event.url.search));
	}
	if ((path === '/dev' || path.startsWith('/dev/')) && isProduction()) {
		return new Response('Not found', { status: 404 });
	}
	return resolve(event);
};

/**
 * Every API body within its limit, before anything reads it (better-auth's endpoints included): a
 * declared length over the limit, or a chunked body passing it, is 413 (http/bodyLimit.ts).
 */
const bodyLimit: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	if (!path.startsWith('/api/')) return resolve(event);
	const limit = bodyLimitFor(path);
	const bounded = await boundedRequest(event.request, limit);
	if (bounded === 'too-large') return payloadTooLargeResponse(limit);
	event.request = bounded;
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

export const handle = sequence(securityHeaders, bodyLimit, clientAddress, identify, guard);

/** At server start: load the analysis workers before the first analysis needs them. */
export const init: ServerInit = () => {
	if (!building) startAnalysisPool();
};
