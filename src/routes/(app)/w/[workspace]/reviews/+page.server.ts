// The review queue of the signed-in member in this workspace (services, checked like the API).
import { db } from '$lib/server/db';
import { authorizePage } from '$lib/server/authz/page';
import { can } from '$lib/authz';
import * as reviews from '$lib/server/services/reviews';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const access = await authorizePage(event, event.params.workspace, 'loop.read', 'workspace');
	return { ...(await reviews.queue(db, event.params.workspace, access.caller.userId)), canDecide: can(access.role, 'loop.approve'), me: access.caller.userId };
};
