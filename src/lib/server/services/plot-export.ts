// The Bode plot of a stored revision as an SVG or PNG file, kept in the export cache under
// everything it shows (the immutable design, the query, the title and the verdict that picks
// the corners), so the export route and the pre-render after a save draw and find the same file.
import { z } from 'zod';
import { networkRoots, plotFromResponse, renderBodePng, renderBodeSvg } from '../exports';
import { cachedExport, exportKey } from '../exports/cache';
import * as analyses from '../analysis-pool';
import { ApiError } from '../http/errors';
import type { Loop } from './signoff';

export const plotQuerySchema = z.object({
	corners: z.enum(['0', '1']).optional(),
	corner: z.coerce.number().int().min(0).max(3).optional(),
	theme: z.enum(['light', 'dark']).optional(),
	width: z.coerce.number().int().min(320).max(2400).optional()
});
export type PlotQuery = z.infer<typeof plotQuerySchema>;

/** The plot file of `row` (drawn for `owner` in the analysis pool when not kept yet); `base` names the rail and revision. */
export function plotFile(owner: string, row: Loop, format: 'svg' | 'png', q: PlotQuery, base: string): Promise<string | Buffer> {
	const v = row.verification;
	const query = { corners: q.corners, corner: q.corner, theme: q.theme, width: q.width };
	const key = exportKey({ plot: row.id, format, q: query, base, verdict: v ? { engineVersion: v.engineVersion, worst: v.worst } : null });
	return cachedExport(key, () => drawPlot(owner, row, format, q, base));
}

async function drawPlot(owner: string, row: Loop, format: 'svg' | 'png', q: PlotQuery, base: string): Promise<string | Buffer> {
	const detail = await analyses.stored(owner, { design: row.design, verification: row.verification });
	if ('error' in detail) throw new ApiError(422, detail.error.code, `the stored design cannot be analysed: ${detail.error.message}`, detail.error.fields);
	const nominal = detail.response;
	const fsw = detail.document.plant.fsw;
	const corners = detail.cornerTraces;
	let plot;
	if (q.corner !== undefined) {
		const c = corners[q.corner];
		if (!c) throw new ApiError(400, 'invalid-query', 'the request failed validation', { corner: corners.length ? `must be 0…${corners.length - 1} (the corners that set the verdict)` : 'this revision has no corner traces' });
		plot = plotFromResponse(nominal, { fswHz: fsw, title: `${base}, ${c.label}`, show: { plant: false, compensator: false }, cornerLoops: [c] });
	} else {
		plot = plotFromResponse(nominal, { fswHz: fsw, cornerLoops: q.corners === '1' ? corners : [], title: `${base} loop gain` });
	}
	const options = { width: q.width ?? 900, theme: q.theme ?? 'light', roots: networkRoots(nominal) } as const;
	if (format === 'svg') return renderBodeSvg(plot, options);
	return renderBodePng(plot, { ...options, pixelWidth: (q.width ?? 900) * 2 });
}
