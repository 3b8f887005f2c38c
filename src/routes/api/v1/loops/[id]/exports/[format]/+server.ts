// GET /api/v1/loops/{id}/exports/{format}: one revision as a file to download.
// csv: the sweep (loop, plant, network); verdict: the stored verdict as CSV (its rows, then
// every corner); svg / png: the Bode plot as on screen (?corners=1 adds the corners that set
// the stored verdict faint, ?corner=N draws that corner alone, ?theme=dark); spice: the
// averaged loop netlist for ngspice (?batch=1 ends it with `quit` for `ngspice -b`); json: the
// design document with the built network's parts and the stored verdict; pdf: the sign-off
// report. Nothing recomputes the verdict. Any member may export (loop.read).
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { ApiError } from '$lib/server/http/errors';
import { parseQuery } from '$lib/server/http/request';
import { exportSignedOffJson, sweepCsv, verdictCsv } from '$lib/server/exports';
import * as loops from '$lib/server/services/loops';
import * as signoff from '$lib/server/services/signoff';
import * as analyses from '$lib/server/analysis-pool';
import { plotFile, plotQuerySchema } from '$lib/server/services/plot-export';
import { z } from 'zod';
import type { RequestHandler } from './$types';

const EXPORT_FORMATS = ['csv', 'verdict', 'svg', 'png', 'spice', 'json', 'pdf'] as const;

const querySchema = plotQuerySchema.extend({ batch: z.enum(['0', '1']).optional() });

const TYPES: Record<(typeof EXPORT_FORMATS)[number], { type: string; ext: string }> = {
	csv: { type: 'text/csv; charset=utf-8', ext: 'csv' },
	verdict: { type: 'text/csv; charset=utf-8', ext: 'csv' },
	svg: { type: 'image/svg+xml; charset=utf-8', ext: 'svg' },
	png: { type: 'image/png', ext: 'png' },
	spice: { type: 'text/plain; charset=utf-8', ext: 'cir' },
	json: { type: 'application/json; charset=utf-8', ext: 'json' },
	pdf: { type: 'application/pdf', ext: 'pdf' }
};

function file(body: string | Buffer, format: keyof typeof TYPES, name: string, inline: boolean) {
	const { type, ext } = TYPES[format];
	const safe = name.replace(/[^A-Za-z0-9_.-]+/g, '_');
	return new Response(typeof body === 'string' ? body : new Uint8Array(body), {
		headers: {
			'content-type': type,
			'content-disposition': `${inline ? 'inline' : 'attachment'}; filename="${safe}.${ext}"`,
			'cache-control': 'private, no-store'
		}
	});
}

export const GET: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	const owner = access.caller.userId;
	const format = event.params.format as (typeof EXPORT_FORMATS)[number];
	if (!(EXPORT_FORMATS as readonly string[]).includes(format)) {
		throw new ApiError(404, 'not-found', `no export called ${format}; use one of ${EXPORT_FORMATS.join(', ')}`);
	}
	const q = parseQuery(event, querySchema);
	const { rail } = await signoff.context(db, row);
	const base = `${rail?.name ?? 'loop'}-r${row.revision}`;
	const inline = format === 'svg' || format === 'png';

	if (format === 'pdf') {
		const pdf = await signoff.reportPdf(db, row, owner);
		if (!Buffer.isBuffer(pdf)) throw new ApiError(422, pdf.error.code, pdf.error.message, pdf.error.fields);
		return file(pdf, 'pdf', `${base}-signoff`, false);
	}
	if (format === 'verdict') {
		if (!row.verification) throw new ApiError(409, 'not-verified', 'this revision has no stored verdict yet; run npm run reverify');
		return file(verdictCsv(row.verification), 'verdict', `${base}-verdict`, false);
	}
	if (format === 'json') {
		const out = exportSignedOffJson(row.design, row.verification, { rail: rail?.name ?? null, revision: row.revision, status: row.status, switchingCheck: row.switchingCheck });
		if (!out.ok) throw new ApiError(422, out.error.code, out.error.message, out.error.fields);
		return file(out.json, 'json', base, false);
	}
	if (format === 'svg' || format === 'png') {
		// The plot shows the immutable design, the corners that set the stored verdict and the title: a repeat is the kept file.
		return file(await plotFile(owner, row, format, q, base), format, base, inline);
	}
	const detail = await analyses.stored(owner, {
		design: row.design,
		verification: null,
		netlist: format === 'spice' ? { batch: q.batch === '1', title: `Loopwright ${base}` } : undefined
	});
	if ('error' in detail) throw new ApiError(422, detail.error.code, `the stored design cannot be analysed: ${detail.error.message}`, detail.error.fields);
	const nominal = detail.response;
	if (format === 'csv') return file(sweepCsv(nominal), 'csv', base, false);
	if (format === 'spice') {
		return file(detail.netlist ?? '', 'spice', base, false);
	}
	throw new ApiError(404, 'not-found', `no export called ${format}`);
});
