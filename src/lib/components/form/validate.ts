// Client-side validation with the same zod schemas the API uses, flattened the same way the
// API flattens them (first message per dotted path; "(body)" for a whole-object rule), so a
// form shows the browser's and the server's errors through one code path.
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;

export function flatten(error: z.ZodError): FieldErrors {
	const fields: FieldErrors = {};
	for (const issue of error.issues) {
		const path = issue.path.map(String).join('.') || '(body)';
		fields[path] ??= issue.message;
	}
	return fields;
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
