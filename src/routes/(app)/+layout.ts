// The signed-in frame's data, for the navigation on every page: the caller with their
// workspaces and roles (GET /api/v1/me) and, inside a workspace, its boards. It reads only the
// workspace parameter, so moving between boards and rails of one workspace asks for nothing
// again; a change of workspace, or `invalidate(NAV)` after a mutation, reads both again. A
// workspace the caller is not in has no boards (null) and its page says so.
import { api, apiLoad } from '$lib/client/api';
import type { Me, Page, Project } from '$lib/client/types';
import { NAV } from '$lib/components/nav/appState.svelte';
import type { LayoutLoad } from './$types';

/** Most boards the switcher lists. */
const NAV_MAX_BOARDS = 200;

export const load: LayoutLoad = async ({ data, fetch, params, url, depends }) => {
	depends(NAV);
	const workspaceId = params.workspace ?? null;
	const [me, boards] = await Promise.all([
		apiLoad<Me>(fetch, '/api/v1/me', url),
		workspaceId ? api.get<Page<Project>>(`/api/v1/projects?workspace=${encodeURIComponent(workspaceId)}&limit=${NAV_MAX_BOARDS}`, fetch) : null
	]);
	return { ...data, me, workspaceId, boards: boards === null ? [] : boards.ok ? boards.data.items : null };
};
