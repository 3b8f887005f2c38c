// JSON error bodies of the REST API: `{ error: { code, message, fields? } }`. Services and
// route handlers throw ApiError; the `endpoint()` wrapper turns it into the response.
import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { ACTION_WORDS, type Action } from '../../authz';
import { zodFields as engineZodFields } from '../../engine/contract/errors';

export type FieldErrors = Record<string, string>;

export class ApiError extends Error {
	constructor(
		readonly status: number,
		readonly code: string,
		message: string,
		readonly fields?: FieldErrors,
		/** Extra members of the error object, e.g. `current` on a 409. */
		readonly extra?: Record<string, unknown>
	) {
		super(message);
	}
}

export const unauthorized = () => new ApiError(401, 'unauthorized', 'sign in or send an API token');
/** 403 in words ("may not approve a loop"), with the action's code kept for API clients. */
export const forbidden = (action: Action) =>
	new ApiError(403, 'forbidden', `your role in this workspace may not ${ACTION_WORDS[action]}`, undefined, { action });
export const notFound = (what = 'resource') => new ApiError(404, 'not-found', `${what} not found`);

/** Flattens zod issues to `{ "plant.inductor.l": "message" }`, first message per path: the engine's one helper, "(body)" for a whole-body rule. */
export function zodFields(error: z.ZodError, prefix = ''): FieldErrors {
	return engineZodFields(error, prefix, '(body)');
}

export function invalid(error: z.ZodError, code = 'invalid-request', prefix = ''): ApiError {
	return new ApiError(400, code, 'the request failed validation', zodFields(error, prefix));
}

/** The API's error body: `{ error: { code, message, fields?, …extra } }`. */
export function errorBody(error: ApiError): { error: Record<string, unknown> } {
	const body: Record<string, unknown> = { code: error.code, message: error.message, ...error.extra };
	if (error.fields) body.fields = error.fields;
	return { error: body };
}

export function errorResponse(error: ApiError): Response {
	const headers: Record<string, string> = { 'cache-control': 'no-store' };
	// A busy answer (429, 503) may say when to come back: `retryAfterS` in the body and the header.
	if (typeof error.extra?.retryAfterS === 'number') headers['retry-after'] = String(error.extra.retryAfterS);
	return json(errorBody(error), { status: error.status, headers });
}

/** Error codes (Node sockets, mysql2) that mean the database cannot be reached right now. */
const DATABASE_DOWN_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'ETIMEDOUT',
	'EPIPE',
	'EHOSTUNREACH',
	'PROTOCOL_CONNECTION_LOST',
	'PROTOCOL_SEQUENCE_TIMEOUT',
	'ER_SERVER_SHUTDOWN',
	'ER_CON_COUNT_ERROR'
]);

/** True when the error, or any error in its `cause` chain (Drizzle wraps mysql2's), says the database is unreachable. */
export function isDatabaseUnavailable(error: unknown): boolean {
	let e: unknown = error;
	for (let depth = 0; e && typeof e === 'object' && depth < 8; depth++) {
		const code = (e as { code?: unknown }).code;
		if (typeof code === 'string' && DATABASE_DOWN_CODES.has(code)) return true;
		if (/Pool is closed|Connection lost: The server closed the connection/i.test(String((e as { message?: unknown }).message ?? ''))) return true;
		e = (e as { cause?: unknown }).cause;
	}
	return false;
}

/** 503 while the database is down: the client may retry; nothing was written. */
export const databaseUnavailable = () =>
	new ApiError(503, 'database-unavailable', 'the database is not answering; nothing was saved, try again in a few seconds');
