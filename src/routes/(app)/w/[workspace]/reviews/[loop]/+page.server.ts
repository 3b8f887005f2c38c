// The review page of one loop revision. The first bytes carry what the database holds (the
// stored verdict, spec, comments, trail and diffs: signoff.reviewRecord); the drawing (plot,
// operating point, closed loop and steps, re-drawn from the stored design in the analysis pool
// with its budgets) is streamed into the same response as it finishes, so the page's first
// byte never waits for an analysis. A pool refusal (too costly, too many, busy) arrives as
// `analysisError` in place of the drawing. Decisions and comments go through /api/v1.
import { error } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { authorizePage } from '$lib/server/authz/page';
import { can } from '$lib/authz';
import { ApiError } from '$lib/server/http/errors';
import * as loops from '$lib/server/services/loops';
import * as signoff from '$lib/server/services/signoff';
import type { PageServerLoad } from './$types';

type Drawing = Awaited<ReturnType<typeof signoff.reviewDrawing>>;

/** The drawing, or its refusal in the drawing's own shape (a streamed promise must not reject into a 500). */
async function drawing(loop: signoff.Loop, owner: string): Promise<Drawing> {
	try {
		return JSON.parse(JSON.stringify(await signoff.reviewDrawing(loop, owner))) as Drawing;
	} catch (e) {
		const failure = e instanceof ApiError ? { code: e.code, message: e.message } : { code: 'internal-error', message: 'the design could not be drawn; the error is logged' };
		if (!(e instanceof ApiError)) console.error('[review drawing]', e);
		return { analysisError: failure, plot: null, operatingPoint: null, network: null, closedLoop: null, steps: null } as Drawing;
	}
}

export const load: PageServerLoad = async (event) => {
	const loop = await loops.get(db, event.params.loop);
	if (!loop || loop.workspaceId !== event.params.workspace) error(404, 'loop not found');
	const access = await authorizePage(event, loop.workspaceId, 'loop.read', 'loop');
	const view = await signoff.reviewRecord(db, loop);
	const isAuthor = loop.authorId === access.caller.userId;
	return {
		view: JSON.parse(JSON.stringify(view)) as typeof view,
		drawing: drawing(loop, access.caller.userId),
		me: access.caller.userId,
		canDecide: can(access.role, 'loop.approve') && !isAuthor && loop.status === 'in-review',
		isAuthor,
		canComment: can(access.role, 'loop.comment'),
		canCheck: can(access.role, 'loop.check')
	};
};
