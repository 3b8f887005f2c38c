// GET /api/v1/rails/{id}/bench: the rail's bench files (metadata, no data), newest first.
// POST: upload one (owner, engineer) as multipart/form-data (`file` plus the metadata fields
// kind, vin, iout, instrument, injectionPoint, measuredAt, notes, phaseReference) or as JSON
// { fileName, text, metadata }. At most 5 MB (413); parse errors are 400 with the line and
// column in `fields.file` and every problem in `issues`.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { ApiError, invalid } from '$lib/server/http/errors';
import { BENCH_MAX_BYTES } from '$lib/bench';
import { benchUploadJsonSchema } from '$lib/schemas/signoff';
import * as bench from '$lib/server/services/bench';
import * as rails from '$lib/server/services/rails';
import type { RequestEvent } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

const tooLarge = () => new ApiError(413, 'payload-too-large', `bench files are limited to ${BENCH_MAX_BYTES / 1024 / 1024} MB`);
/** Room for the multipart framing or the JSON escaping around a file at the limit. */
const BODY_SLACK = 1.25;

const NUMBER_FIELDS = ['vin', 'iout'] as const;
const TEXT_FIELDS = ['kind', 'instrument', 'injectionPoint', 'measuredAt', 'notes', 'phaseReference'] as const;

/** Multipart metadata arrives as text: empty means absent, numbers are read as numbers (a bad one stays text so zod names it). */
function metadataFromForm(form: FormData): Record<string, unknown> {
	const out: Record<string, unknown> = {};
	for (const key of NUMBER_FIELDS) {
		const v = form.get(key);
		if (typeof v === 'string' && v.trim() !== '') out[key] = Number.isFinite(Number(v)) ? Number(v) : v;
	}
	for (const key of TEXT_FIELDS) {
		const v = form.get(key);
		if (typeof v === 'string' && v.trim() !== '') out[key] = v;
	}
	return out;
}

async function readUpload(event: RequestEvent) {
	const declared = Number(event.request.headers.get('content-length') ?? 0);
	if (declared > BENCH_MAX_BYTES * BODY_SLACK) throw tooLarge();
	const type = event.request.headers.get('content-type') ?? '';
	if (type.startsWith('multipart/form-data')) {
		const form = await event.request.formData().catch(() => {
			throw new ApiError(400, 'invalid-request', 'the multipart body could not be read');
		});
		const file = form.get('file');
		if (!(file instanceof File)) throw new ApiError(400, 'invalid-request', 'the request failed validation', { file: 'attach the analyzer file as `file`' });
		if (file.size > BENCH_MAX_BYTES) throw tooLarge();
		return { fileName: file.name || 'bench.csv', text: await file.text(), sizeBytes: file.size, metadata: metadataFromForm(form) };
	}
	if (/^application\/(.+\+)?json\b/i.test(type)) {
		const raw = await event.request.text();
		if (Buffer.byteLength(raw) > BENCH_MAX_BYTES * BODY_SLACK) throw tooLarge();
		let value: unknown;
		try {
			value = JSON.parse(raw);
		} catch {
			throw new ApiError(400, 'invalid-json', 'the body is not valid JSON');
		}
		const parsed = benchUploadJsonSchema.safeParse(value);
		if (!parsed.success) throw invalid(parsed.error);
		const sizeBytes = Buffer.byteLength(parsed.data.text);
		if (sizeBytes > BENCH_MAX_BYTES) throw tooLarge();
		return { ...parsed.data, sizeBytes };
	}
	throw new ApiError(415, 'unsupported-media-type', 'send multipart/form-data with a `file`, or application/json');
}

export const GET: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await rails.get(db, event.params.id), 'rail.read', 'rail');
	return { items: await bench.list(db, row.id) };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'bench.upload', 'rail');
	const upload = await readUpload(event);
	return created(await bench.upload(db, access.caller, row, upload));
});
