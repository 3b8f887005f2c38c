// Everything the rail design screen opens with, read in one answer so the page renders with its
// data (no chain of requests from the browser): the rail with its spec and "verdict changed"
// flag, the caller's role, the latest revision's design (the form starts from it), the rail's
// revisions for the history panel, the latest revision's sign-off requests with who could be
// asked, and the rail's bench files. Bounded: the history stops at SCREEN_MAX_ROWS (its total
// says when there are more), the bench list at bench.list's 200, and the stored verdict, the heaviest
// column, is left out: the screen computes its own and the review page reads the stored one.
import { count, desc, eq } from 'drizzle-orm';
import type { Database } from '../db';
import { loopRevision, user } from '../db/schema';
import type { Role } from '../../authz';
import * as bench from './bench';
import { summaryColumns } from './loops';
import * as rails from './rails';
import * as reviews from './reviews';
import * as workspaces from './workspaces';

/** Most revisions and bench files one answer lists. */
export const SCREEN_MAX_ROWS = 200;

/** The latest revision with its design, without the stored verdict. */
async function latestWithDesign(db: Database, loopId: string) {
	const [row] = await db
		.select({ ...summaryColumns, design: loopRevision.design })
		.from(loopRevision)
		.leftJoin(user, eq(user.id, loopRevision.authorId))
		.where(eq(loopRevision.id, loopId))
		.limit(1);
	return row ?? null;
}

async function history(db: Database, railId: string) {
	const [items, [{ total }]] = await Promise.all([
		db
			.select(summaryColumns)
			.from(loopRevision)
			.leftJoin(user, eq(user.id, loopRevision.authorId))
			.where(eq(loopRevision.railId, railId))
			.orderBy(desc(loopRevision.revision))
			.limit(SCREEN_MAX_ROWS),
		db.select({ total: count() }).from(loopRevision).where(eq(loopRevision.railId, railId))
	]);
	return { items, total };
}

export async function railScreen(db: Database, row: rails.Rail, role: Role | null) {
	const [targets, revisions, benchFiles] = await Promise.all([workspaces.marginTargets(db, row.workspaceId), history(db, row.id), bench.list(db, row.id)]);
	const top = revisions.items[0] ?? null;
	const [latest, requests, candidates] = top
		? await Promise.all([latestWithDesign(db, top.id), reviews.requestsFor(db, top.id), reviews.candidates(db, row.workspaceId, top.authorId)])
		: [null, [], []];
	return {
		rail: rails.present(row, targets, top?.revision ?? null),
		role,
		latest,
		history: revisions,
		review: latest ? { requests, candidates } : null,
		bench: { items: benchFiles }
	};
}
