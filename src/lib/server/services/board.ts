// Board health in one query: every rail of a board with its latest revision's status and the
// headline of the verdict stored with it at save (loop_revision.verdict_headline, written by the
// database beside the verdict), whatever the number of rails.
// The latest revision is found through the (rail_id, revision) unique index: a correlated
// MAX per rail, then one index lookup, so the cost grows with rails, not with revisions.
import { and, asc, count, eq, sql } from 'drizzle-orm';
import type { Database } from '../db';
import { loopRevision, rail, type LoopStatus } from '../db/schema';
import type { VerdictHeadline } from '../../verdict/figures';

/** Most rows one board answer carries (the response stays bounded; `truncated` says when a board has more). */
export const BOARD_MAX_RAILS = 1000;

/**
 * A board row carries what the board table shows and its edit form starts from: the rail's name,
 * topology, operating point and notes, its "verdict changed" flag and latest revision number, and
 * that revision's id, review status and stored verdict headline. The rail's spec sections,
 * tolerances and targets, and the revision's author and message, stay with the rail and revision
 * endpoints: about 2 kB a row less than a whole rail with its whole summary.
 */
const boardRailColumns = {
	id: rail.id,
	name: rail.name,
	topology: rail.topology,
	vout: rail.vout,
	vinNom: rail.vinNom,
	vinMin: rail.vinMin,
	vinMax: rail.vinMax,
	ioutNom: rail.ioutNom,
	ioutMin: rail.ioutMin,
	ioutMax: rail.ioutMax,
	fsw: rail.fsw,
	notes: rail.notes,
	verdictFlag: rail.verdictFlag
};
const boardLoopColumns = { id: loopRevision.id, revision: loopRevision.revision, status: loopRevision.status, verification: loopRevision.verdictHeadline };

/** The latest revision of a rail as the board shows it: its review status and the verdict's headline. */
export type BoardLoop = { id: string; revision: number; status: LoopStatus; verification: VerdictHeadline | null };
export type BoardRail = Pick<typeof rail.$inferSelect, keyof typeof boardRailColumns> & { latestRevision: number | null; latest: BoardLoop | null };

export async function boardRails(db: Database, projectId: string): Promise<{ rails: BoardRail[]; total: number; truncated: boolean }> {
	const latestOf = sql`(select max(${sql.raw('l2.revision')}) from ${loopRevision} as l2 where ${sql.raw('l2.rail_id')} = ${rail.id})`;
	const [rows, [{ total }]] = await Promise.all([
		db
			.select({ rail: boardRailColumns, latest: boardLoopColumns })
			.from(rail)
			.leftJoin(loopRevision, and(eq(loopRevision.railId, rail.id), eq(loopRevision.revision, latestOf)))
			.where(eq(rail.projectId, projectId))
			.orderBy(asc(rail.name))
			.limit(BOARD_MAX_RAILS),
		db.select({ total: count() }).from(rail).where(eq(rail.projectId, projectId))
	]);
	return {
		rails: rows.map(({ rail: r, latest }) => {
			const summary = latest && latest.id ? (latest as BoardLoop) : null;
			return { ...r, latestRevision: summary?.revision ?? null, latest: summary };
		}),
		total,
		truncated: total > rows.length
	};
}
