// DELETE /api/v1/rails/{id}/verdict-flag: acknowledge that re-verification changed the verdict
// of the rail's latest revision (owner, engineer). Answers the rail without its flag.
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import * as rails from '$lib/server/services/rails';
import * as workspaces from '$lib/server/services/workspaces';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'rail.update', 'rail');
	const cleared = await rails.acknowledgeFlag(db, access.caller, row);
	return rails.present(cleared, await workspaces.marginTargets(db, row.workspaceId), await rails.latestRevision(db, row.id));
});
