// POST /api/v1/loops/{id}/template { name, description? }: saves the revision's compensator
// strategy as a workspace template that scales with the plant (crossover as a fraction of
// fsw, zeros relative to f0, poles relative to fsw, part series). 409 on a duplicate name.
import { db } from '$lib/server/db';
import { authorize, authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { ApiError } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { templateFromLoopSchema } from '$lib/schemas/signoff';
import * as analyses from '$lib/server/analysis-pool';
import * as loops from '$lib/server/services/loops';
import * as templates from '$lib/server/services/templates';
import { strategyFromDesign } from '$lib/server/services/template-use';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = endpoint(async (event) => {
	const { row } = await authorizeRow(event, await loops.get(db, event.params.id), 'loop.read', 'loop');
	const { caller } = await authorize(event, row.workspaceId, 'template.create', 'loop');
	const input = await parseBody(event, templateFromLoopSchema);
	const detail = await analyses.analyzeDocument(caller.userId, row.design, { includeResponse: false, closedLoop: false, sections: false });
	if ('error' in detail) throw new ApiError(422, detail.error.code, `the stored design cannot be analysed: ${detail.error.message}`, detail.error.fields);
	const compensator = strategyFromDesign(detail.document, detail.response);
	const tpl = await templates.create(db, caller, row.workspaceId, {
		name: input.name,
		description: input.description ?? null,
		topology: detail.document.plant.topology,
		compensator
	});
	return created(tpl);
});
