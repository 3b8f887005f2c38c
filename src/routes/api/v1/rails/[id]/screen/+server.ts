// GET /api/v1/rails/{id}/screen: the rail design screen's data in one answer (rail, your role,
// the latest revision's design, the history, sign-off requests and bench files; see
// services/rail-screen.ts). It needs rail.read and loop.read (every role has both); another
// workspace's rail answers 404. It takes no query or body.
import { db } from '$lib/server/db';
import { can } from '$lib/authz';
import { authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { forbidden } from '$lib/server/http/errors';
import * as rails from '$lib/server/services/rails';
import { railScreen } from '$lib/server/services/rail-screen';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'rail.read', 'rail');
	// The same membership answers the second action: no second look-up.
	if (!can(access.role, 'loop.read')) throw forbidden('loop.read');
	return railScreen(db, row, access.role);
});
