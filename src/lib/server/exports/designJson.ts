/**
 * Design document export and import as JSON (contract v1). Import parses the text, then validates with the engine's
 * zod contract; every problem comes back as the contract's error object with dotted field paths, never a throw.
 */
import { contractError, designDocumentSchema, SCHEMA_VERSION, zodFields, type ContractError, type DesignDocument } from '$lib/engine';

/** Largest accepted design file, bytes of text (a design document is a few kB). */
export const DESIGN_JSON_MAX_CHARS = 1024 * 1024;

export type DesignImportResult = { ok: true; document: DesignDocument } | ({ ok: false } & ContractError);

/** Pretty JSON of a validated document (defaults filled in, so the file states every value the engine used). */
export function exportDesignJson(doc: unknown): { ok: true; json: string } | ({ ok: false } & ContractError) {
	const parsed = designDocumentSchema.safeParse(doc);
	if (!parsed.success) return { ok: false, ...contractError(zodFields(parsed.error)) };
	return { ok: true, json: JSON.stringify(parsed.data, null, 2) + '\n' };
}

export function importDesignJson(text: string): DesignImportResult {
	if (text.length > DESIGN_JSON_MAX_CHARS) {
		return { ok: false, ...contractError({ '(document)': `is larger than ${DESIGN_JSON_MAX_CHARS / 1024} kB` }) };
	}
	let value: unknown;
	try {
		value = JSON.parse(text.replace(/^\uFEFF/, ''));
	} catch (e) {
		const why = e instanceof Error ? e.message : String(e);
		return { ok: false, ...contractError({ '(document)': `is not valid JSON (${why})` }) };
	}
	if (typeof value === 'object' && value !== null && 'schemaVersion' in value) {
		const v = (value as { schemaVersion: unknown }).schemaVersion;
		if (typeof v === 'number' && v > SCHEMA_VERSION) {
			return { ok: false, ...contractError({ schemaVersion: `is ${v}; this version of Loopwright reads up to ${SCHEMA_VERSION}` }) };
		}
	}
	const parsed = designDocumentSchema.safeParse(value);
	if (!parsed.success) return { ok: false, ...contractError(zodFields(parsed.error)) };
	return { ok: true, document: parsed.data };
}
