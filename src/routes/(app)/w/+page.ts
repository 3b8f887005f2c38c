// The signed-in home. With exactly one workspace it goes straight into it (its page shows the
// same lists for that workspace); `?choose` stays here to start another one. Otherwise: the
// workspaces (the layout's /api/v1/me), and what waits for the caller across them (GET /api/v1/home).
import { redirect } from '@sveltejs/kit';
import { apiLoad } from '$lib/client/api';
import type { HomeData } from '$lib/client/types';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ fetch, url, parent }) => {
	const { me } = await parent();
	if (me.workspaces.length === 1 && !url.searchParams.has('choose')) redirect(307, `/w/${me.workspaces[0].id}`);
	const home = me.workspaces.length > 0 ? await apiLoad<HomeData>(fetch, '/api/v1/home', url) : null;
	return { me, home };
};
