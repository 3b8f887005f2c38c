// The review page of one loop revision, in two reads of GET /api/v1/loops/{id}/report. The
// record (`?part=record`: what the database holds, the stored verdict, spec, comments, trail and
// diffs) is awaited, so the server-rendered page carries it and its first byte never waits for an
// analysis. The drawing (`?part=drawing`: plot, operating point, closed loop and steps, drawn
// again from the stored design in the analysis pool with its budgets) is asked for only in the
// browser and not awaited: the page shows "Drawing…" until it arrives. Server rendering leaves it
// out, since a drawing started there would not reach the browser (a universal load's promise is
// not streamed) and would only spend the caller's analysis budget. A refusal (too costly, busy)
// arrives as `analysisError`. Decisions and comments go through /api/v1 and then invalidateAll.
import { browser } from '$app/environment';
import { error } from '@sveltejs/kit';
import { api, apiLoad } from '$lib/client/api';
import type { ReviewDrawing, ReviewRecord } from '$lib/client/types';
import type { PageLoad } from './$types';

/** The drawing, or the API's refusal in the drawing's own shape (the page shows its message in place of the plot). */
async function drawing(fetchFn: typeof fetch, loopId: string): Promise<ReviewDrawing> {
	const result = await api.get<ReviewDrawing>(`/api/v1/loops/${loopId}/report?part=drawing`, fetchFn);
	if (result.ok) return result.data;
	return { analysisError: { code: result.error.code, message: result.error.message }, plot: null, operatingPoint: null, modulator: null, network: null, closedLoop: null, steps: null, sensitivity: null };
}

export const load: PageLoad = async ({ fetch, params, url }) => {
	const view = await apiLoad<ReviewRecord>(fetch, `/api/v1/loops/${params.loop}/report?part=record`, url);
	if (view.loop.workspaceId !== params.workspace) error(404, 'loop not found');
	return { view, drawing: browser ? drawing(fetch, view.loop.id) : null };
};
