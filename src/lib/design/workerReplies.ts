/**
 * The one loop of the design screen's one-answer workers (verdict, closed loop, sensitivity):
 * every request carries an id, and exactly one message goes back with that id, the result or an
 * error sentence (also for an exception, so a panel never waits for an answer that never comes).
 */
import { z } from 'zod';
import { designDocumentSchema, zodFields, type DesignDocument } from '$lib/engine';

/** A reply without its id (the loop adds the request's). */
export type Reply<From> = From extends unknown ? Omit<From, 'id'> : never;

export function answerEachRequest<To extends { id: number }, From extends { id: number; type: string }>(answer: (request: To) => Reply<From>): void {
	// As on the page (hooks.client.ts): zod's eval probe would be a Content-Security-Policy violation.
	z.config({ jitless: true });
	// Typed by hand: the project's TypeScript lib is the DOM's, not the worker's.
	const ctx = self as unknown as { postMessage(m: From): void; onmessage: ((e: MessageEvent<To>) => void) | null };
	ctx.onmessage = (e: MessageEvent<To>) => {
		let reply: Reply<From> | { type: 'error'; message: string };
		try {
			reply = answer(e.data);
		} catch (err) {
			reply = { type: 'error', message: err instanceof Error ? err.message : String(err) };
		}
		ctx.postMessage({ ...reply, id: e.data.id } as From);
	};
}

/** The document checked against the contract, or the error sentence naming each field and its rule. */
export function validDocument(document: unknown): { document: DesignDocument } | { type: 'error'; message: string } {
	const parsed = designDocumentSchema.safeParse(document);
	if (parsed.success) return { document: parsed.data };
	return { type: 'error', message: Object.entries(zodFields(parsed.error)).map(([k, v]) => `${k} ${v}`).join('; ') };
}
