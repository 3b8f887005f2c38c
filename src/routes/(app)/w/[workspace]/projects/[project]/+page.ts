// The board-health page's data: one request for the board, the caller's role, the workspace's
// targets and every rail with its latest stored verdict (GET /api/v1/projects/{id}/board).
// A board of another workspace than the address names is "not found", like the API's 404.
import { error } from '@sveltejs/kit';
import { apiLoad } from '$lib/client/api';
import type { Board } from '$lib/client/types';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ fetch, params, url }) => {
	const board = await apiLoad<Board>(fetch, `/api/v1/projects/${params.project}/board`, url);
	if (board.project.workspaceId !== params.workspace) error(404, 'project not found');
	return { board };
};
