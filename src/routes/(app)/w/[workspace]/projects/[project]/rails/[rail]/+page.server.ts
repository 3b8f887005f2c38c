// The rail design screen needs a signed-in caller; its data comes from /api/v1 in the browser,
// where every endpoint checks the caller's role again.
import { redirect } from '@sveltejs/kit';
import { signInPath } from '$lib/safeRedirect';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	if (!locals.user) redirect(303, signInPath(url.pathname + url.search));
	return { userName: locals.user.name };
};
