/**
 * Messages between the design screen and the sensitivity worker (sensitivity.worker.ts): the
 * screen sends the document it would save (with its tolerances); the worker answers with the
 * engine's ranked sensitivities of it, the same report the review page and the PDF show.
 */
import type { DesignDocumentInput } from '$lib/engine';
import type { SensitivityReport } from '$lib/engine/sensitivity';

export type ToSensitivity = { id: number; document: DesignDocumentInput };

export type FromSensitivity = { id: number; type: 'sensitivity'; report: SensitivityReport } | { id: number; type: 'error'; message: string };
