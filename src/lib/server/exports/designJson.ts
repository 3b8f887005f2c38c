/**
 * Design document export and import as JSON (contract v1). Import parses the text, then validates with the engine's
 * zod contract; every problem comes back as the contract's error object with dotted field paths, never a throw.
 */
import { contractError, designDocumentSchema, SCHEMA_VERSION, zodFields, type ContractError, type DesignDocument } from '$lib/engine';
import type { Verification } from '$lib/engine/verify/types';
import type { StoredSwitchingCheck } from '$lib/verdict/switchingText';

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

/** Network parts a document may carry (compensator.parts); the divider bottom Rb follows from Vref. */
const BUILT_PART_KEYS = ['r2', 'r3', 'c1', 'c2', 'c3', 'gm', 'ro'] as const;

/**
 * The signed-off file of a revision: its document (spec sections included) with the network
 * fixed to the parts as built (rounded where a series was set), so importing it reproduces the
 * built network whatever placement does later, plus a `signoff` record of how it was placed, the
 * parts (ideal, rounded, series), the stored verdict and the switching check kept with the
 * revision (null when none was run). The engine ignores `signoff` on import.
 */
export function exportSignedOffJson(
	doc: unknown,
	verification: Verification | null,
	meta: { rail: string | null; revision: number; status: string; switchingCheck?: StoredSwitchingCheck | null }
): { ok: true; json: string } | ({ ok: false } & ContractError) {
	const parsed = designDocumentSchema.safeParse(doc);
	if (!parsed.success) return { ok: false, ...contractError(zodFields(parsed.error)) };
	const d = parsed.data;
	const built = verification ? (verification.parts.rounded ?? verification.parts.ideal) : null;
	const parts = built ? Object.fromEntries(BUILT_PART_KEYS.filter((k) => built[k] !== undefined).map((k) => [k, built[k]])) : null;
	const { target: _target, series: _series, parts: _parts, ...keep } = d.compensator as Record<string, unknown>;
	const out = {
		...d,
		compensator: parts ? { ...keep, parts, series: null } : d.compensator,
		signoff: {
			rail: meta.rail,
			revision: meta.revision,
			status: meta.status,
			placement: { target: d.compensator.target ?? null, series: d.compensator.series ?? null },
			parts: verification?.parts ?? null,
			engineVersion: verification?.engineVersion ?? null,
			verification,
			switchingCheck: meta.switchingCheck ?? null
		}
	};
	return { ok: true, json: JSON.stringify(out, null, 2) + '\n' };
}

/**
 * The API's answer to a file that failed import: the message says each problem once ("the design
 * file is not valid JSON (…)"), and the fields sit under `document.` for the form, a rule on the
 * whole file under `document` itself (it read "document.(document)" and twice over before).
 */
export function importFailure(error: ContractError['error']): { message: string; fields: Record<string, string> } {
	const entries = Object.entries(error.fields ?? {});
	const fields = Object.fromEntries(entries.map(([k, v]) => [k === '(document)' ? 'document' : `document.${k}`, v]));
	const said = entries.map(([k, v]) => (k === '(document)' ? v : `${k} ${v}`)).join('; ');
	return { message: said ? `the design file ${entries.length === 1 && entries[0][0] === '(document)' ? '' : 'failed validation: '}${said}` : error.message, fields };
}
