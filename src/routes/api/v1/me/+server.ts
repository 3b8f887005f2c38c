// GET /api/v1/me: the caller and their workspaces with the role in each.
import { db } from '$lib/server/db';
import { requireCaller } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	return {
		user: { id: caller.userId, email: caller.email, name: caller.name },
		authenticatedBy: event.locals.authenticatedBy,
		activeWorkspaceId: event.locals.session?.activeOrganizationId ?? null,
		workspaces: await workspaces.listForUser(db, caller.userId)
	};
});
