// GET /api/v1/me: the caller and their workspaces with the role in each (with a token bound to
// one workspace, that one only). PATCH: change the display name.
import { eq } from 'drizzle-orm';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { user } from '$lib/server/db/schema';
import { requireCaller } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { parseBody } from '$lib/server/http/request';
import { profileSchema } from '$lib/schemas/auth';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	const bound = event.locals.tokenWorkspaceId;
	const mine = await workspaces.listForUser(db, caller.userId);
	return {
		user: { id: caller.userId, email: caller.email, name: caller.name },
		authenticatedBy: event.locals.authenticatedBy,
		activeWorkspaceId: event.locals.session?.activeOrganizationId ?? null,
		tokenWorkspaceId: bound,
		workspaces: bound ? mine.filter((w) => w.id === bound) : mine
	};
});

export const PATCH: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	const { name } = await parseBody(event, profileSchema);
	// Through better-auth for a session, so the signed session copy in its cookie carries the new name at once.
	if (event.locals.authenticatedBy === 'session') await auth.api.updateUser({ body: { name }, headers: event.request.headers });
	else await db.update(user).set({ name, updatedAt: new Date() }).where(eq(user.id, caller.userId));
	return { user: { id: caller.userId, email: caller.email, name } };
});
