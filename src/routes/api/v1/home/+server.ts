// GET /api/v1/home: the signed-in home's three lists (services/home.ts) over every workspace the
// caller may read, or one (?workspace=<id>: 404 unless they are a member). Each list holds at
// most HOME_LIST_LIMIT entries.
import { db } from '$lib/server/db';
import { authorize, requireCaller } from '$lib/server/authz/guard';
import { can } from '$lib/authz';
import { endpoint } from '$lib/server/http/endpoint';
import { parseQuery } from '$lib/server/http/request';
import * as home from '$lib/server/services/home';
import * as workspaces from '$lib/server/services/workspaces';
import { homeQuerySchema } from '$lib/schemas/workspace';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	const query = parseQuery(event, homeQuerySchema);
	const bound = event.locals.tokenWorkspaceId;
	const requested = query.workspace ?? bound;
	let ids: string[];
	if (requested) {
		await authorize(event, requested, 'loop.read', 'workspace');
		ids = [requested];
	} else {
		ids = (await workspaces.listForUser(db, caller.userId)).filter((w) => can(w.role, 'loop.read')).map((w) => w.id).slice(0, home.HOME_WORKSPACE_LIMIT);
	}
	const [pendingReviews, attentionRails, activity] = await Promise.all([
		home.pendingReviews(db, caller.userId, ids),
		home.railsNeedingAttention(db, caller.userId, ids),
		home.recentActivity(db, ids)
	]);
	return { workspaceIds: ids, pendingReviews, attentionRails, activity, limit: home.HOME_LIST_LIMIT };
});
