// Wraps every /api/v1 handler: turns ApiError (and unexpected failures) into JSON error
// bodies and marks responses as uncacheable. Bodies are serialised once and encoded once:
// SvelteKit's json() encodes the string a second time only to compute content-length, which
// costs ~0.5 ms on a 220 kB analysis (scripts/load.ts profiles).
import { isHttpError, type RequestEvent } from '@sveltejs/kit';
import { ApiError, databaseUnavailable, errorResponse, isDatabaseUnavailable } from './errors';

export function endpoint<E extends RequestEvent>(handler: (event: E) => Promise<Response | unknown>) {
	return async (event: E): Promise<Response> => {
		try {
			const result = await handler(event);
			if (result instanceof Response) return result;
			return jsonBody(result, 200);
		} catch (error) {
			if (error instanceof ApiError) return errorResponse(error);
			// adapter-node's BODY_SIZE_LIMIT, met while a handler reads the body: the same 413 as our own limit.
			if (isPayloadTooLarge(error)) return errorResponse(new ApiError(413, 'payload-too-large', (error as Error).message || 'the body is too large'));
			if (isHttpError(error)) {
				return errorResponse(new ApiError(error.status, 'http-error', error.body.message));
			}
			if (isDatabaseUnavailable(error)) return errorResponse(databaseUnavailable());
			console.error('[api]', event.request.method, event.url.pathname, error);
			return errorResponse(new ApiError(500, 'internal-error', 'the server failed to answer; the error is logged'));
		}
	};
}

function isPayloadTooLarge(error: unknown): boolean {
	return typeof error === 'object' && error !== null && (error as { status?: unknown }).status === 413;
}

/** A JSON answer that must not be cached: one JSON.stringify, one UTF-8 encoding, exact content-length. */
export function jsonBody(body: unknown, status: number): Response {
	return jsonText(JSON.stringify(body) ?? 'null', status);
}

/** A JSON answer serialised elsewhere (an analysis worker), sent as it is. */
export function jsonText(text: string, status: number): Response {
	const bytes = Buffer.from(text, 'utf8');
	return new Response(bytes, {
		status,
		headers: { 'content-type': 'application/json', 'content-length': String(bytes.byteLength), 'cache-control': 'no-store' }
	});
}

export const created = (body: unknown) => jsonBody(body, 201);
export const noContent = () => new Response(null, { status: 204 });
