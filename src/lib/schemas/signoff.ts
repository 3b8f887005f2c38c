// zod schemas of the sign-off, template, bench and import requests, shared by the API routes,
// the OpenAPI document and the pages. Numbers SI as in the design document.
import { z } from 'zod';
import { fitRequestFields, withFitRules } from '../engine/fit/schema';

export const templateFromLoopSchema = z.object({
	name: z.string().trim().min(1, 'name is required').max(120),
	description: z.string().trim().max(4000).nullable().optional()
});

/** POST /loops/{id}/switching-check: the frequencies to measure (Hz), or none for the check's defaults. */
export const switchingCheckRequestSchema = z
	.object({
		freqHz: z
			.array(z.number().finite('must be a number').positive('must be above 0 Hz'))
			.min(1, 'give at least one frequency')
			.max(16, 'at most 16 frequencies')
			.optional()
	})
	.strict();

export const templateApplySchema = z.object({
	railId: z.string().min(1, 'name the rail').max(36),
	/** false: preview the parts and margins only; true: save them as the rail's next revision. */
	save: z.boolean().default(false),
	message: z.string().trim().min(1).max(500).optional()
});

/** The JSON form of a bench upload (multipart/form-data carries the same fields and a `file`). */
export const benchUploadJsonSchema = z.object({
	fileName: z.string().trim().min(1, 'name the file').max(255),
	/** The file's text, CSV or TSV as the analyzer wrote it. */
	text: z.string().min(1, 'the file is empty'),
	metadata: z.record(z.string(), z.unknown()).default({})
});

/** Import of a design document into a rail: the file's text, or the document itself. */
export const designImportSchema = z
	.object({
		text: z.string().min(1).optional(),
		document: z.unknown().optional(),
		message: z.string().trim().min(1, 'say what changed').max(500).default('Imported design document'),
		/** The revision the import replaces (409 when another landed meanwhile); null for the first. */
		baseRevision: z.number().int().min(0).nullable()
	})
	.refine((v) => v.text !== undefined || v.document !== undefined, { message: 'send the file as text or the document as document', path: ['text'] });

/**
 * POST /api/v1/rails/{id}/bench/{benchId}/fit: the fit request (engine/fit/schema.ts) plus which
 * revision to fit (default the rail's latest) and whether to save the fitted values as the next one.
 */
export const benchFitSchema = withFitRules(
	fitRequestFields.extend({
		loopId: z.string().min(1).max(36, { error: 'not a revision id' }).optional(),
		save: z.boolean({ error: 'must be true or false' }).default(false),
		message: z.string().trim().min(1, { error: 'say what changed' }).max(500, { error: 'at most 500 characters' }).optional()
	})
);
export type BenchFitInput = z.infer<typeof benchFitSchema>;
