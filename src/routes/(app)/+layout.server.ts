// The signed-in area: every page under (app) needs a user. hooks.server.ts already turns
// signed-out visitors away from /w and /app; this load checks again (pages may sit elsewhere)
// and hands the user's display name to the navigation. Data itself is fetched from /api/v1.
import { redirect } from '@sveltejs/kit';
import { signInPath } from '$lib/safeRedirect';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = ({ locals, url }) => {
	if (!locals.user) redirect(303, signInPath(url.pathname + url.search));
	return { user: { id: locals.user.id, name: locals.user.name, email: locals.user.email } };
};
