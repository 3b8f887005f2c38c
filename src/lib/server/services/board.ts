// Board health in one query: every rail of a board with its latest revision's summary and the
// headline of the verdict stored with it at save (loop_revision.verdict_headline, written by the
// database beside the verdict), whatever the number of rails.
// The latest revision is found through the (rail_id, revision) unique index: a correlated
// MAX per rail, then one index lookup, so the cost grows with rails, not with revisions.
import { and, asc, count, eq, sql } from 'drizzle-orm';
import type { Database } from '../db';
import { loopRevision, rail, user } from '../db/schema';
import { summaryColumns, type LoopSummary } from './loops';
import type { VerdictHeadline } from '../../verdict/figures';
import * as rails from './rails';
import type { MarginTargets } from './types';

/** Most rows one board answer carries (the response stays bounded; `truncated` says when a board has more). */
export const BOARD_MAX_RAILS = 1000;

/** The latest revision of a rail as the board shows it: its summary and the verdict's headline. */
export type BoardLoop = Omit<LoopSummary, 'verification'> & { verification: VerdictHeadline | null };
export type BoardRail = ReturnType<typeof rails.present> & { latest: BoardLoop | null };


export async function boardRails(db: Database, projectId: string, targets: MarginTargets): Promise<{ rails: BoardRail[]; total: number; truncated: boolean }> {
	const latestOf = sql`(select max(${sql.raw('l2.revision')}) from ${loopRevision} as l2 where ${sql.raw('l2.rail_id')} = ${rail.id})`;
	const [rows, [{ total }]] = await Promise.all([
		db
			.select({ rail, latest: { ...summaryColumns, verification: loopRevision.verdictHeadline } })
			.from(rail)
			.leftJoin(loopRevision, and(eq(loopRevision.railId, rail.id), eq(loopRevision.revision, latestOf)))
			.leftJoin(user, eq(user.id, loopRevision.authorId))
			.where(eq(rail.projectId, projectId))
			.orderBy(asc(rail.name))
			.limit(BOARD_MAX_RAILS),
		db.select({ total: count() }).from(rail).where(eq(rail.projectId, projectId))
	]);
	return {
		rails: rows.map(({ rail: r, latest }) => {
			const summary = latest && latest.id ? (latest as BoardLoop) : null;
			return { ...rails.present(r, targets, summary?.revision ?? null), latest: summary };
		}),
		total,
		truncated: total > rows.length
	};
}
