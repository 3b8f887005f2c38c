// GET /api/v1/projects/{id}/board: everything the board-health page shows, in one request:
// the board, the caller's role, the workspace's margin targets and every rail (up to
// BOARD_MAX_RAILS, `truncated` beyond) with what the table shows of it and of its latest
// revision (services/board.ts: status and the stored verdict's headline).
// Any member may read it (rail.read); another workspace's board answers 404.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { boardRails } from '$lib/server/services/board';
import * as projects from '$lib/server/services/projects';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row: project, access } = await authorizeRow(event, await projects.get(db, event.params.id), 'rail.read', 'project');
	const targets = await workspaces.marginTargets(db, project.workspaceId);
	const { rails, total, truncated } = await boardRails(db, project.id);
	return { project, role: access.role, targets, rails, total, truncated };
});
