// Reading and validating API requests: JSON bodies with a size limit (413), zod validation
// of bodies and query strings (400 with field errors), and list pagination.
import type { RequestEvent } from '@sveltejs/kit';
import { z } from 'zod';
import { ApiError, invalid } from './errors';

/** Largest accepted JSON body. A design document with a custom sweep is a few hundred kB at most. */
export const MAX_BODY_BYTES = 1_000_000;

export async function readJson(event: RequestEvent): Promise<unknown> {
	const type = event.request.headers.get('content-type') ?? '';
	if (!/^application\/(.+\+)?json\b/i.test(type)) {
		throw new ApiError(415, 'unsupported-media-type', 'send the body as application/json');
	}
	const declared = Number(event.request.headers.get('content-length') ?? 0);
	if (declared > MAX_BODY_BYTES) throw tooLarge();
	const text = await event.request.text();
	if (Buffer.byteLength(text) > MAX_BODY_BYTES) throw tooLarge();
	try {
		return JSON.parse(text);
	} catch {
		throw new ApiError(400, 'invalid-json', 'the body is not valid JSON');
	}
}

function tooLarge() {
	return new ApiError(413, 'payload-too-large', `the body exceeds ${MAX_BODY_BYTES} bytes`);
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
