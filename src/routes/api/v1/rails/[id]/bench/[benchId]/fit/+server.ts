// POST /api/v1/rails/{id}/bench/{benchId}/fit { parameters, response?, startHz?, stopHz?, loss?,
// fScale?, maxIterations?, loopId?, save?, message? }: the uncertain parameters of a revision
// (default the rail's latest) fitted to the bench file, in the analysis pool. Anyone who may read
// the rail may run it; `save: true` (owner, engineer) stores the fitted design as the next
// revision, verified like any save. 400 invalid-fit names the field and the rule.
import { db } from '$lib/server/db';
import { authorize, authorizeRow } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import { parseBody } from '$lib/server/http/request';
import { loopRevision } from '$lib/server/db/schema';
import { benchFitSchema } from '$lib/schemas/signoff';
import * as bench from '$lib/server/services/bench';
import * as loops from '$lib/server/services/loops';
import * as rails from '$lib/server/services/rails';
import { desc, eq } from 'drizzle-orm';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = endpoint(async (event) => {
	const { row: rail, access } = await authorizeRow(event, await rails.get(db, event.params.id), 'rail.read', 'rail');
	const input = await parseBody(event, benchFitSchema);
	if (input.save) await authorize(event, access.workspaceId, 'loop.save', 'rail');
	const file = await bench.get(db, event.params.benchId);
	if (!file || file.railId !== rail.id) throw notFound('bench file');
	let loop: { id: string; revision: number; design: unknown; railId: string } | null = null;
	if (input.loopId) {
		loop = await loops.get(db, input.loopId);
		if (!loop || loop.railId !== rail.id) throw notFound('loop');
	} else {
		const [latest] = await db.select().from(loopRevision).where(eq(loopRevision.railId, rail.id)).orderBy(desc(loopRevision.revision)).limit(1);
		loop = latest ?? null;
		if (!loop) throw notFound('loop');
	}
	return bench.fit(db, access.caller, rail, file, loop, input);
});
