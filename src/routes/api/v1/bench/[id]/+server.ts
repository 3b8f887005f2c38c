// GET /api/v1/bench/{id}[?loop=<revision id>]: one bench file with its data and its overlay on
// a loop revision of the same rail (default: the rail's latest): measured fc, PM and GM, the
// model's, and the deviation over the band up to fsw/2. DELETE (owner, engineer) removes it.
import { db } from '$lib/server/db';
import { authorize, authorizeRow } from '$lib/server/authz/guard';
import { endpoint, noContent } from '$lib/server/http/endpoint';
import { notFound } from '$lib/server/http/errors';
import { loopRevision } from '$lib/server/db/schema';
import * as bench from '$lib/server/services/bench';
import * as loops from '$lib/server/services/loops';
import { desc, eq } from 'drizzle-orm';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = endpoint(async (event) => {
	const { row, access } = await authorizeRow(event, await bench.get(db, event.params.id), 'rail.read', 'bench file');
	const loopId = event.url.searchParams.get('loop');
	let loop: { id: string; revision: number; design: unknown; railId: string } | null = null;
	if (loopId) {
		const found = await loops.get(db, loopId);
		if (!found || found.railId !== row.railId) throw notFound('loop');
		loop = found;
	} else {
		const [latest] = await db.select().from(loopRevision).where(eq(loopRevision.railId, row.railId)).orderBy(desc(loopRevision.revision)).limit(1);
		loop = latest ?? null;
	}
	const { series, ...rest } = row;
	return {
		...rest,
		series,
		against: loop ? { loopId: loop.id, revision: loop.revision } : null,
		overlay: loop ? await bench.overlay(access.caller.userId, row, loop.design) : null
	};
});

export const DELETE: RequestHandler = endpoint(async (event) => {
	const row = await bench.get(db, event.params.id);
	const { access } = await authorizeRow(event, row, 'rail.read', 'bench file');
	await authorize(event, access.workspaceId, 'bench.upload', 'bench file');
	await bench.remove(db, access.caller, row!);
	return noContent();
});
