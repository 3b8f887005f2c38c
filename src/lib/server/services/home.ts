// The signed-in home: what waits for the caller across the workspaces they may read. Three short
// lists, each bounded: the sign-offs asked of them and not yet given, their rails whose stored
// verdict (the latest revision's, never recomputed) is caution or fail, and the latest activity
// (revisions saved, reviews asked, sign-offs given). "Their rails": rails they added or saved a
// revision of.
import { and, desc, eq, inArray, isNotNull, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/mysql-core';
import type { Database } from '../db';
import { loopRevision, organization, project, rail, reviewRequest, user } from '../db/schema';
import { withShortCorners } from '../../verdict/cornerList';

/** Entries per list: a home page is a glance, the review queue and the board hold the rest. */
export const HOME_LIST_LIMIT = 20;
/** Workspaces one home answer looks into (the caller's first ones by name); one named with ?workspace= always works. */
export const HOME_WORKSPACE_LIMIT = 50;

export type ActivityKind = 'revision' | 'review-requested' | 'approved' | 'changes-requested';

export interface ActivityEntry {
	kind: ActivityKind;
	at: Date;
	/** Who did it (null when their account is gone). */
	actorName: string | null;
	/** Whom a review was asked of. */
	reviewerName: string | null;
	workspaceId: string;
	workspaceName: string;
	projectId: string;
	projectName: string;
	railId: string;
	railName: string;
	loopId: string;
	revision: number;
	message: string | null;
}

const place = {
	workspaceId: loopRevision.workspaceId,
	workspaceName: organization.name,
	projectId: project.id,
	projectName: project.name,
	railId: rail.id,
	railName: rail.name,
	loopId: loopRevision.id,
	revision: loopRevision.revision
};

export async function pendingReviews(db: Database, userId: string, workspaceIds: string[]) {
	if (workspaceIds.length === 0) return [];
	const requester = alias(user, 'requester');
	return db
		.select({ ...place, requestedAt: reviewRequest.createdAt, requestedByName: requester.name, note: reviewRequest.note, message: loopRevision.message })
		.from(reviewRequest)
		.innerJoin(loopRevision, eq(loopRevision.id, reviewRequest.loopId))
		.innerJoin(rail, eq(rail.id, loopRevision.railId))
		.innerJoin(project, eq(project.id, rail.projectId))
		.innerJoin(organization, eq(organization.id, loopRevision.workspaceId))
		.leftJoin(requester, eq(requester.id, reviewRequest.requestedBy))
		.where(and(eq(reviewRequest.reviewerId, userId), eq(reviewRequest.status, 'pending'), inArray(reviewRequest.workspaceId, workspaceIds)))
		.orderBy(desc(reviewRequest.createdAt))
		.limit(HOME_LIST_LIMIT);
}

/** The caller's rails whose latest revision's stored verdict is caution or fail, worst first. */
export async function railsNeedingAttention(db: Database, userId: string, workspaceIds: string[]) {
	if (workspaceIds.length === 0) return [];
	// Only the status, the summary and the rows' corner names of the stored verdict are read, not the per-corner list.
	const status = sql<'caution' | 'fail'>`JSON_VALUE(${loopRevision.verification}, '$.status')`;
	const summary = sql<string | null>`JSON_VALUE(${loopRevision.verification}, '$.summary')`;
	const rowCorners = sql<unknown>`JSON_EXTRACT(${loopRevision.verification}, '$.rows[*].corner')`;
	const latest = sql`${loopRevision.revision} = (SELECT MAX(x.revision) FROM loop_revision x WHERE x.rail_id = ${rail.id})`;
	const authored = sql`EXISTS (SELECT 1 FROM loop_revision a WHERE a.rail_id = ${rail.id} AND a.author_id = ${userId})`;
	const rows = await db
		.select({ ...place, status, summary, rowCorners, savedAt: loopRevision.createdAt })
		.from(rail)
		.innerJoin(project, eq(project.id, rail.projectId))
		.innerJoin(organization, eq(organization.id, rail.workspaceId))
		.innerJoin(loopRevision, and(eq(loopRevision.railId, rail.id), latest))
		.where(and(inArray(rail.workspaceId, workspaceIds), or(eq(rail.createdBy, userId), authored), sql`${status} IN ('caution', 'fail')`))
		.orderBy(sql`${status} = 'fail' DESC`, desc(loopRevision.createdAt))
		.limit(HOME_LIST_LIMIT);
	// On screen the summary names its corner briefly, as the verdict panel and the board do.
	return rows.map(({ rowCorners: names, ...r }) => ({ ...r, summary: r.summary ? withShortCorners(r.summary, cornerNames(names)) : null }));
}

/** The rows' corner names as JSON_EXTRACT answers them (a JSON array, as text or already read by the driver), or none. */
function cornerNames(extracted: unknown): string[] {
	let list = extracted;
	if (typeof list === 'string') {
		try {
			list = JSON.parse(list);
		} catch {
			return [];
		}
	}
	return Array.isArray(list) ? list.filter((c): c is string => typeof c === 'string') : [];
}

/** The latest revisions, review requests and sign-offs in the workspaces, newest first. */
export async function recentActivity(db: Database, workspaceIds: string[]): Promise<ActivityEntry[]> {
	if (workspaceIds.length === 0) return [];
	const actor = alias(user, 'actor');
	const reviewer = alias(user, 'reviewer');
	const [saved, asked, decided] = await Promise.all([
		db
			.select({ ...place, at: loopRevision.createdAt, actorName: actor.name, message: loopRevision.message })
			.from(loopRevision)
			.innerJoin(rail, eq(rail.id, loopRevision.railId))
			.innerJoin(project, eq(project.id, rail.projectId))
			.innerJoin(organization, eq(organization.id, loopRevision.workspaceId))
			.leftJoin(actor, eq(actor.id, loopRevision.authorId))
			.where(inArray(loopRevision.workspaceId, workspaceIds))
			.orderBy(desc(loopRevision.createdAt))
			.limit(HOME_LIST_LIMIT),
		db
			.select({ ...place, at: reviewRequest.createdAt, actorName: actor.name, reviewerName: reviewer.name })
			.from(reviewRequest)
			.innerJoin(loopRevision, eq(loopRevision.id, reviewRequest.loopId))
			.innerJoin(rail, eq(rail.id, loopRevision.railId))
			.innerJoin(project, eq(project.id, rail.projectId))
			.innerJoin(organization, eq(organization.id, loopRevision.workspaceId))
			.leftJoin(actor, eq(actor.id, reviewRequest.requestedBy))
			.leftJoin(reviewer, eq(reviewer.id, reviewRequest.reviewerId))
			.where(inArray(reviewRequest.workspaceId, workspaceIds))
			.orderBy(desc(reviewRequest.createdAt))
			.limit(HOME_LIST_LIMIT),
		// A sign-off is the revision's own status change to approved or changes-requested.
		db
			.select({ ...place, at: loopRevision.statusChangedAt, actorName: actor.name, status: loopRevision.status })
			.from(loopRevision)
			.innerJoin(rail, eq(rail.id, loopRevision.railId))
			.innerJoin(project, eq(project.id, rail.projectId))
			.innerJoin(organization, eq(organization.id, loopRevision.workspaceId))
			.leftJoin(actor, eq(actor.id, loopRevision.statusChangedBy))
			.where(and(inArray(loopRevision.workspaceId, workspaceIds), inArray(loopRevision.status, ['approved', 'changes-requested']), isNotNull(loopRevision.statusChangedAt)))
			.orderBy(desc(loopRevision.statusChangedAt))
			.limit(HOME_LIST_LIMIT)
	]);
	const entries: ActivityEntry[] = [
		...saved.map((r) => ({ ...r, kind: 'revision' as const, reviewerName: null })),
		...asked.map((r) => ({ ...r, kind: 'review-requested' as const, message: null })),
		...decided.map(({ status, ...r }) => ({ ...r, at: r.at!, kind: status as 'approved' | 'changes-requested', reviewerName: null, message: null }))
	];
	return entries.sort((a, b) => b.at.getTime() - a.at.getTime()).slice(0, HOME_LIST_LIMIT);
}
