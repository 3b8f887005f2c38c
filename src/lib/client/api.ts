// Browser calls to the JSON API under /api/v1. Every call resolves to a tagged result, never
// throws: `ok` with the body, or the API's error `{ code, message, fields }` (a network failure
// becomes code "network"), so pages can show errors at the fields the server named.

export interface ApiFailure {
	status: number;
	code: string;
	message: string;
	/** Field path → message, as the API's zod validation reported it. */
	fields: Record<string, string>;
}

export type ApiResult<T> = { ok: true; status: number; data: T } | { ok: false; status: number; error: ApiFailure };

async function call<T>(method: string, url: string, body?: unknown): Promise<ApiResult<T>> {
	let response: Response;
	try {
		response = await fetch(url, {
			method,
			headers: body === undefined ? { accept: 'application/json' } : { accept: 'application/json', 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
	} catch {
		return { ok: false, status: 0, error: { status: 0, code: 'network', message: 'the server could not be reached', fields: {} } };
	}
	if (response.status === 204) return { ok: true, status: 204, data: undefined as T };
	const parsed: unknown = await response.json().catch(() => null);
	if (response.ok) return { ok: true, status: response.status, data: parsed as T };
	const error = (parsed as { error?: Partial<ApiFailure> } | null)?.error ?? {};
	return {
		ok: false,
		status: response.status,
		error: {
			status: response.status,
			code: error.code ?? 'http-error',
			message: error.message ?? `the server answered HTTP ${response.status}`,
			fields: error.fields ?? {}
		}
	};
}

export const api = {
	get: <T>(url: string) => call<T>('GET', url),
	post: <T>(url: string, body: unknown) => call<T>('POST', url, body),
	patch: <T>(url: string, body: unknown) => call<T>('PATCH', url, body),
	delete: (url: string) => call<void>('DELETE', url)
};

/** Like `api.get` but throws the API's message; for loaders that show one error state. */
export async function getOrThrow<T>(url: string): Promise<T> {
	const result = await api.get<T>(url);
	if (!result.ok) throw new Error(result.error.message);
	return result.data;
}
