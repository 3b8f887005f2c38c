// Wraps every /api/v1 handler: turns ApiError (and unexpected failures) into JSON error
// bodies and marks responses as uncacheable.
import { isHttpError, json, type RequestEvent } from '@sveltejs/kit';
import { ApiError, databaseUnavailable, errorResponse, isDatabaseUnavailable } from './errors';

export function endpoint<E extends RequestEvent>(handler: (event: E) => Promise<Response | unknown>) {
	return async (event: E): Promise<Response> => {
		try {
			const result = await handler(event);
			if (result instanceof Response) return result;
			return json(result, { headers: { 'cache-control': 'no-store' } });
		} catch (error) {
			if (error instanceof ApiError) return errorResponse(error);
			if (isHttpError(error)) {
				return errorResponse(new ApiError(error.status, 'http-error', error.body.message));
			}
			if (isDatabaseUnavailable(error)) return errorResponse(databaseUnavailable());
			console.error('[api]', event.request.method, event.url.pathname, error);
			return errorResponse(new ApiError(500, 'internal-error', 'the server failed to answer; the error is logged'));
		}
	};
}

export const created = (body: unknown) => json(body, { status: 201, headers: { 'cache-control': 'no-store' } });
export const noContent = () => new Response(null, { status: 204 });
