// A workspace's home: what waits for the caller here (GET /api/v1/home?workspace=) and its
// members, read side by side; the boards come with the layout's navigation data. A workspace
// the caller is not in answers 404, which the page itself explains, so errors are kept as data.
import { api } from '$lib/client/api';
import type { HomeData, MemberRow } from '$lib/client/types';
import type { Remote } from '$lib/components/nav/appState.svelte';
import type { PageLoad } from './$types';

/** The dependency a mutation on this page invalidates to read it again. */
export const _WORKSPACE_HOME = 'app:workspace-home';

export const load: PageLoad = async ({ fetch, params, depends }) => {
	depends(_WORKSPACE_HOME);
	const id = encodeURIComponent(params.workspace);
	const [home, members] = await Promise.all([api.get<HomeData>(`/api/v1/home?workspace=${id}`, fetch), api.get<{ items: MemberRow[] }>(`/api/v1/workspaces/${id}/members`, fetch)]);
	const memberRows: Remote<MemberRow[]> = members.ok ? { phase: 'ready', data: members.data.items } : { phase: 'error', message: members.error.message };
	return { home: home.ok ? home.data : null, members: memberRows };
};
