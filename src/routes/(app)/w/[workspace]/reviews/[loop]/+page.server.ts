// The review page of one loop revision: everything computed on the server (signoff.reviewView),
// plus what the caller may do here. Decisions and comments go through /api/v1.
import { error } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { authorizePage } from '$lib/server/authz/page';
import { can } from '$lib/authz';
import * as loops from '$lib/server/services/loops';
import * as signoff from '$lib/server/services/signoff';
import { pageAnalysis } from '$lib/server/analysis-pool/page';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const loop = await loops.get(db, event.params.loop);
	if (!loop || loop.workspaceId !== event.params.workspace) error(404, 'loop not found');
	const access = await authorizePage(event, loop.workspaceId, 'loop.read', 'loop');
	const view = await pageAnalysis(() => signoff.reviewView(db, loop, access.caller.userId));
	const isAuthor = loop.authorId === access.caller.userId;
	return {
		view: JSON.parse(JSON.stringify(view)) as typeof view,
		me: access.caller.userId,
		canDecide: can(access.role, 'loop.approve') && !isAuthor && loop.status === 'in-review',
		isAuthor,
		canComment: can(access.role, 'loop.comment')
	};
};
