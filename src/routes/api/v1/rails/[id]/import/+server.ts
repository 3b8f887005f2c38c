// POST /api/v1/rails/{id}/import { text | document, message?, baseRevision }: a design JSON
// file saved as the rail's next revision, after the contract's validation (400 invalid-design
// with `fields` named `document.<path>`), the topology check (422) and the stale-base check (409).
import { db } from '$lib/server/db';
import { authorizeRow } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { ApiError } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { importDesignJson, importFailure } from '$lib/server/exports';
import { designImportSchema } from '$lib/schemas/signoff';
import * as loops from '$lib/server/services/loops';
import * as rails from '$lib/server/services/rails';
import * as audit from '$lib/server/services/audit';
import { prerenderExports } from '$lib/server/services/export-prerender';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = endpoint(async (event) => {
	const { row: rail, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'loop.save', 'rail');
	const input = await parseBody(event, designImportSchema);
	const result = importDesignJson(input.text ?? JSON.stringify(input.document));
	if (!result.ok) {
		const answer = importFailure(result.error);
		throw new ApiError(400, 'invalid-design', answer.message, answer.fields);
	}
	const row = await loops.save(db, access.caller, rail, { baseRevision: input.baseRevision, design: result.document, message: input.message });
	await audit.record(db, { workspaceId: rail.workspaceId, actor: access.caller, action: 'loop.import', entityType: 'loop', entityId: row.id, after: { railId: rail.id, revision: row.revision } });
	prerenderExports(db, row.id, access.caller.userId);
	return created(row);
});
