// Reading and validating API requests: JSON bodies within their size limit (413, ./bodyLimit), zod validation
// of bodies and query strings (400 with field errors), and list pagination.
import type { RequestEvent } from '@sveltejs/kit';
import { z } from 'zod';
import { MAX_BODY_BYTES, payloadTooLarge, readBodyLimited } from './bodyLimit';
import { ApiError, invalid } from './errors';

export { MAX_BODY_BYTES };

export async function readJson(event: RequestEvent): Promise<unknown> {
	const type = event.request.headers.get('content-type') ?? '';
	if (!/^application\/(.+\+)?json\b/i.test(type)) {
		throw new ApiError(415, 'unsupported-media-type', 'send the body as application/json');
	}
	const declared = Number(event.request.headers.get('content-length') ?? 0);
	const bytes = declared > MAX_BODY_BYTES ? null : await readBodyLimited(event.request.body, MAX_BODY_BYTES);
	// The request hook already bounds every API body (./bodyLimit); this holds for any other caller.
	if (bytes === null) throw payloadTooLarge(MAX_BODY_BYTES);
	try {
		// TextDecoder drops a leading byte-order mark, as Request.text() did.
		return JSON.parse(new TextDecoder().decode(bytes));
	} catch {
		throw new ApiError(400, 'invalid-json', 'the body is not valid JSON');
	}
}

export async function parseBody<S extends z.ZodType>(event: RequestEvent, schema: S): Promise<z.infer<S>> {
	const result = schema.safeParse(await readJson(event));
	if (!result.success) throw invalid(result.error);
	return result.data;
}

export function parseQuery<S extends z.ZodType>(event: RequestEvent, schema: S): z.infer<S> {
	const result = schema.safeParse(Object.fromEntries(event.url.searchParams));
	if (!result.success) throw invalid(result.error, 'invalid-query');
	return result.data;
}

export const pageQuery = z.object({
	limit: z.coerce.number().int().min(1).max(200).default(50),
	offset: z.coerce.number().int().min(0).default(0)
});
export type PageQuery = z.infer<typeof pageQuery>;

export interface Page<T> {
	items: T[];
	page: { limit: number; offset: number; total: number };
}
