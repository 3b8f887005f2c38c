// Helpers for form actions: validate FormData with a zod schema and turn better-auth's
// APIError into a form message, so actions answer `fail(status, { errors, values })`.
import { fail } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import type { z } from 'zod';
import { zodFields } from './errors';

export type FormErrors = Record<string, string>;

export async function readForm<S extends z.ZodType>(request: Request, schema: S, keepValues: string[] = []) {
	const raw = Object.fromEntries(await request.formData());
	const values = Object.fromEntries(keepValues.map((k) => [k, typeof raw[k] === 'string' ? raw[k] : '']));
	const parsed = schema.safeParse(raw);
	if (!parsed.success) return { ok: false as const, failure: fail(400, { errors: zodFields(parsed.error), values }) };
	return { ok: true as const, data: parsed.data as z.infer<S>, values };
}

/** better-auth's error as a form failure; anything else is rethrown. */
export function authFailure(error: unknown, values: Record<string, string>, messages: Record<string, string> = {}) {
	if (error instanceof APIError) {
		const code = String((error.body as { code?: string } | undefined)?.code ?? '');
		const message = messages[code] ?? (error.body as { message?: string } | undefined)?.message ?? error.message;
		return fail(error.statusCode >= 500 ? 500 : error.statusCode, { errors: { form: message } as FormErrors, values });
	}
	throw error;
}
