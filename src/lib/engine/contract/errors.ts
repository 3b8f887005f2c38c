/**
 * The contract's error shape: `{ error: { code, message, fields: { 'plant.inductor.l': 'must be > 0' } } }`
 * (HTTP 400, CLI exit 2). Field keys are dotted document paths; array indices are numbers
 * ('plant.capacitors.0.c').
 */
import type { ZodError } from 'zod';

export interface ContractError {
	error: {
		/** 'invalid-design' for a document that breaks a rule; 'compensator-infeasible' when the
		 * requested compensator cannot be built for this plant; 'analysis-failed' for an
		 * unexpected numerical failure inside the engine (a bug to report, never a crash). */
		code: 'invalid-design' | 'compensator-infeasible' | 'analysis-failed';
		message: string;
		fields: Record<string, string>;
	};
}

export function contractError(fields: Record<string, string>, code: ContractError['error']['code'] = 'invalid-design', message?: string): ContractError {
	const entries = Object.entries(fields);
	const summary =
		message ??
		(entries.length === 0
			? 'The design document is invalid.'
			: `The design document is invalid: ${entries.map(([k, v]) => `${k} ${v}`).join('; ')}.`);
	return { error: { code, message: summary, fields } };
}

/**
 * Dotted field path → first message, from a zod error: the one zod-error-to-fields helper of the
 * project (the API, the forms, the engine). `prefix` is put before every path (a string or path
 * segments); `root` names a rule on the whole value ('(document)' here, '(body)' for the API).
 */
export function zodFields(error: ZodError, prefix: string | string[] = [], root = '(document)'): Record<string, string> {
	prefix = typeof prefix === 'string' ? (prefix ? [prefix] : []) : prefix;
	const fields: Record<string, string> = {};
	for (const issue of error.issues) {
		// A union failure reports the branch issues; surface the most specific one.
		const nested = (issue as { errors?: { path: PropertyKey[]; message: string }[][] }).errors;
		if (issue.code === 'invalid_union' && nested && nested.length) {
			const best = nested.reduce((a, b) => (b.length < a.length ? b : a));
			for (const sub of best) {
				const key = [...prefix, ...issue.path.map(String), ...sub.path.map(String)].join('.');
				fields[key] ??= sub.message;
			}
			if (best.length) continue;
		}
		const key = [...prefix, ...issue.path.map(String)].join('.') || root;
		fields[key] ??= issue.message;
	}
	return fields;
}

export const isContractError = (x: unknown): x is ContractError =>
	typeof x === 'object' && x !== null && 'error' in x && typeof (x as ContractError).error?.code === 'string';
