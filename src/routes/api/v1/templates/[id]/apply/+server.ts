// POST /api/v1/templates/{id}/apply { railId, save?, message? }: places the template's network
// on the rail's power stage with the engine and answers the parts and the achieved margins at
// every corner. With save: true (owner, engineer) it also saves them as the rail's next
// revision, which records the template. Without save any member may preview.
import { db } from '$lib/server/db';
import { authorize, authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { templateApplySchema } from '$lib/schemas/signoff';
import * as rails from '$lib/server/services/rails';
import * as templates from '$lib/server/services/templates';
import { apply } from '$lib/server/services/template-use';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = endpoint(async (event) => {
	const { row: tpl } = await authorizeRow(event, await templates.get(db, event.params.id), 'template.read', 'template');
	const input = await parseBody(event, templateApplySchema);
	const target = await rails.get(db, input.railId);
	if (!target || target.workspaceId !== tpl.workspaceId) throw notFound('rail');
	const { caller } = await authorize(event, tpl.workspaceId, input.save ? 'loop.save' : 'rail.read', 'rail');
	const result = await apply(db, caller, tpl, target, { save: input.save, message: input.message });
	return input.save ? created(result) : result;
});
