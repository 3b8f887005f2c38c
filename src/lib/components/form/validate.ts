// Client-side validation with the same zod schemas the API uses, flattened the same way the
// API flattens them (first message per dotted path; "(body)" for a whole-object rule), so a
// form shows the browser's and the server's errors through one code path.
import type { z } from 'zod';
import { zodFields } from '$lib/engine/contract/errors';

export type FieldErrors = Record<string, string>;

/** The project's one zod-error-to-fields helper (engine contract/errors.ts), "(body)" for a whole-object rule. */
export function flatten(error: z.ZodError): FieldErrors {
	return zodFields(error, [], '(body)');
}

export function validate<S extends z.ZodType>(schema: S, value: unknown): { ok: true; data: z.infer<S> } | { ok: false; fields: FieldErrors } {
	const result = schema.safeParse(value);
	return result.success ? { ok: true, data: result.data } : { ok: false, fields: flatten(result.error) };
}

/** Errors the form has no field for, as one line (a 409 on a field we show is not among them). */
export function otherErrors(fields: FieldErrors, shown: readonly string[]): string {
	return Object.entries(fields)
		.filter(([k]) => !shown.includes(k))
		.map(([k, v]) => (k === '(body)' ? v : `${k}: ${v}`))
		.join('; ');
}
