// JSON error bodies of the REST API: `{ error: { code, message, fields? } }`. Services and
// route handlers throw ApiError; the `endpoint()` wrapper turns it into the response.
import { json } from '@sveltejs/kit';
import type { z } from 'zod';

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
export const forbidden = (action: string) =>
	new ApiError(403, 'forbidden', `your role in this workspace may not ${action}`);
export const notFound = (what = 'resource') => new ApiError(404, 'not-found', `${what} not found`);

/** Flattens zod issues to `{ "plant.inductor.l": "message" }`, first message per path. */
export function zodFields(error: z.ZodError, prefix = ''): FieldErrors {
	const fields: FieldErrors = {};
	for (const issue of error.issues) {
		const path = [prefix, ...issue.path.map(String)].filter(Boolean).join('.') || '(body)';
		fields[path] ??= issue.message;
	}
	return fields;
}

export function invalid(error: z.ZodError, code = 'invalid-request', prefix = ''): ApiError {
	return new ApiError(400, code, 'the request failed validation', zodFields(error, prefix));
}

export function errorResponse(error: ApiError): Response {
	const body: Record<string, unknown> = { code: error.code, message: error.message, ...error.extra };
	if (error.fields) body.fields = error.fields;
	return json({ error: body }, { status: error.status, headers: { 'cache-control': 'no-store' } });
}
