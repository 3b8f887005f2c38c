// The one way pages talk to the JSON API under /api/v1.
// - `apiLoad(fetch, url)` is for load functions (+page.ts / +layout.ts): it takes SvelteKit's
//   `fetch` (so server rendering calls the API in-process with the caller's cookies and the
//   browser reuses the answer), returns the body, and turns an API error into SvelteKit's
//   error page (401 → the sign-in page that comes back here).
// - `api.get/post/put/patch/delete` are for mutations from components: they never throw and
//   resolve to a tagged result, `ok` with the body or the API's error `{ code, message, fields }`
//   (a network failure becomes code "network"), so forms show errors at the fields the server
//   named. After a successful mutation a page calls `invalidate`/`invalidateAll`.
import { error, redirect } from '@sveltejs/kit';
import { signInPath } from '$lib/safeRedirect';

export interface ApiFailure {
	status: number;
	code: string;
	message: string;
	/** Field path → message, as the API's zod validation reported it. */
	fields: Record<string, string>;
	/** Whatever else the error carried (a 409's `currentRevision`, a bench file's `issues`). */
	[detail: string]: unknown;
}

export type ApiResult<T> = { ok: true; status: number; data: T } | { ok: false; status: number; error: ApiFailure };

export type Fetch = typeof fetch;

/** A JSON value, or FormData for multipart uploads (the browser sets its content type). */
export type ApiBody = unknown;

function headersFor(body: ApiBody): Record<string, string> {
	if (body === undefined || body instanceof FormData) return { accept: 'application/json' };
	return { accept: 'application/json', 'content-type': 'application/json' };
}

async function call<T>(method: string, url: string, body?: ApiBody, fetchFn: Fetch = fetch): Promise<ApiResult<T>> {
	let response: Response;
	try {
		response = await fetchFn(url, {
			method,
			headers: headersFor(body),
			body: body === undefined ? undefined : body instanceof FormData ? body : JSON.stringify(body)
		});
	} catch {
		return { ok: false, status: 0, error: { status: 0, code: 'network', message: 'the server could not be reached', fields: {} } };
	}
	if (response.status === 204) return { ok: true, status: 204, data: undefined as T };
	const parsed: unknown = await response.json().catch(() => null);
	if (response.ok) return { ok: true, status: response.status, data: parsed as T };
	const failure = (parsed as { error?: Partial<ApiFailure> } | null)?.error ?? {};
	return {
		ok: false,
		status: response.status,
		error: {
			...failure,
			status: response.status,
			code: failure.code ?? 'http-error',
			message: failure.message ?? `the server answered HTTP ${response.status}`,
			fields: failure.fields ?? {}
		}
	};
}

export const api = {
	get: <T>(url: string, fetchFn?: Fetch) => call<T>('GET', url, undefined, fetchFn),
	post: <T>(url: string, body: ApiBody, fetchFn?: Fetch) => call<T>('POST', url, body, fetchFn),
	put: <T>(url: string, body: ApiBody, fetchFn?: Fetch) => call<T>('PUT', url, body, fetchFn),
	patch: <T>(url: string, body: ApiBody, fetchFn?: Fetch) => call<T>('PATCH', url, body, fetchFn),
	delete: <T = void>(url: string, body?: ApiBody, fetchFn?: Fetch) => call<T>('DELETE', url, body, fetchFn)
};

/**
 * GET for a load function: the body, or SvelteKit's error page with the API's status and
 * message (a network failure shows as 503). `here` is the page to come back to after sign-in.
 */
export async function apiLoad<T>(fetchFn: Fetch, url: string, here?: URL): Promise<T> {
	const result = await call<T>('GET', url, undefined, fetchFn);
	if (result.ok) return result.data;
	if (result.status === 401 && here) redirect(303, signInPath(here.pathname + here.search));
	error(result.status === 0 ? 503 : result.status, result.error.message);
}
