/**
 * Messages between the design screen and the verdict worker (verify.worker.ts): the screen sends
 * the document it would save; the worker answers with the engine's verifyDesign of it (the same
 * function the server stores at save) and the corner report drawn on the Corners tab.
 */
import type { DesignDocumentInput, Verification } from '$lib/engine';
import type { CornerReport } from '$lib/engine/corners/corners';

export type ToVerifier = { type: 'verify'; id: number; document: DesignDocumentInput; traceFreqHz: number[] };

export type FromVerifier =
	| { type: 'verdict'; id: number; verification: Verification; corners: CornerReport; elapsedMs: number }
	| { type: 'error'; id: number; message: string };
