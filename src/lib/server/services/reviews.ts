// Sign-off around a loop revision: who was asked to review it (one review_request row per
// reviewer, each e-mailed), the decision (which also answers the requests and e-mails the
// author), each reviewer's queue, and the last approved revision of a rail for the diff.
// Status moves themselves stay in loops.review (transitions, the author-may-not-decide rule).
import { randomUUID } from 'node:crypto';
import { and, asc, desc, eq, inArray, lt, sql } from 'drizzle-orm';
import type { Database } from '../db';
import { loopRevision, member, project, rail, reviewRequest, user, type ReviewRequestStatus } from '../db/schema';
import { can } from '../../authz';
import { ApiError } from '../http/errors';
import { sendMail } from '../mail/transport';
import { reviewDecisionMail, reviewRequestMail } from '../mail/review-messages';
import * as audit from './audit';
import * as loops from './loops';
import type { Actor } from './types';

type Loop = NonNullable<Awaited<ReturnType<typeof loops.get>>>;

export interface MailOutcome {
	sent: string[];
	failed: { to: string; reason: string }[];
}

export const reviewPath = (workspaceId: string, loopId: string) => `/w/${workspaceId}/reviews/${loopId}`;

/** Members of the workspace who may sign off (owners and reviewers), without the author. */
export async function candidates(db: Database, workspaceId: string, authorId: string | null) {
	const rows = await db
		.select({ userId: member.userId, role: member.role, name: user.name, email: user.email })
		.from(member)
		.innerJoin(user, eq(user.id, member.userId))
		.where(eq(member.organizationId, workspaceId))
		.orderBy(asc(user.name));
	return rows.filter((r) => can(r.role, 'loop.approve') && r.userId !== authorId);
}

export async function requestsFor(db: Database, loopId: string) {
	return db
		.select({
			id: reviewRequest.id,
			reviewerId: reviewRequest.reviewerId,
			reviewerName: user.name,
			reviewerEmail: user.email,
			requestedBy: reviewRequest.requestedBy,
			status: reviewRequest.status,
			note: reviewRequest.note,
			createdAt: reviewRequest.createdAt,
			decidedAt: reviewRequest.decidedAt
		})
		.from(reviewRequest)
		.innerJoin(user, eq(user.id, reviewRequest.reviewerId))
		.where(eq(reviewRequest.loopId, loopId))
		.orderBy(asc(reviewRequest.createdAt));
}

async function railName(db: Database, railId: string): Promise<string> {
	const [row] = await db.select({ name: rail.name }).from(rail).where(eq(rail.id, railId)).limit(1);
	return row?.name ?? 'rail';
}

async function deliver(mails: { to: string; subject: string; text: string; html?: string }[]): Promise<MailOutcome> {
	const outcome: MailOutcome = { sent: [], failed: [] };
	// Sequential: the fake and small relays dislike bursts, and the list is at most 10 long.
	for (const mail of mails) {
		try {
			await sendMail(mail);
			outcome.sent.push(mail.to);
		} catch (error) {
			console.error('[mail] review mail to', mail.to, 'failed:', error);
			outcome.failed.push({ to: mail.to, reason: error instanceof Error ? error.message : String(error) });
		}
	}
	return outcome;
}

/**
 * Asks `reviewerIds` to sign off `loop`. A draft (or a revision sent back) moves to in-review;
 * a revision already in review just gains reviewers. Every reviewer must be an owner or
 * reviewer of the workspace and not the author; each gets a queue entry and an e-mail.
 */
export async function request(db: Database, actor: Actor & { name: string }, loop: Loop, reviewerIds: string[], note: string | undefined, origin: string) {
	const ids = [...new Set(reviewerIds)];
	const pool = await candidates(db, loop.workspaceId, null);
	const fields: Record<string, string> = {};
	const chosen = ids.map((id, i) => {
		const who = pool.find((c) => c.userId === id);
		if (!who) fields[`reviewerIds.${i}`] = 'is not an owner or reviewer of this workspace';
		else if (id === loop.authorId) fields[`reviewerIds.${i}`] = 'wrote this revision and cannot review it';
		return who;
	});
	if (Object.keys(fields).length) throw new ApiError(400, 'invalid-reviewers', 'some reviewers cannot sign off this revision', fields);

	const moved = loop.status === 'in-review' ? loop : await loops.review(db, actor, loop, 'request-review', note);
	const now = new Date();
	await db.transaction(async (tx) => {
		for (const who of chosen) {
			const id = randomUUID();
			await tx
				.insert(reviewRequest)
				.values({ id, workspaceId: loop.workspaceId, loopId: loop.id, reviewerId: who!.userId, requestedBy: actor.userId, status: 'pending', note: note ?? null, createdAt: now })
				.onDuplicateKeyUpdate({ set: { status: 'pending', requestedBy: actor.userId, note: note ?? null, createdAt: now, decidedAt: null } });
			await audit.record(tx, {
				workspaceId: loop.workspaceId,
				actor,
				action: 'review.request',
				entityType: 'review_request',
				entityId: loop.id,
				after: { loopId: loop.id, revision: loop.revision, reviewerId: who!.userId, reviewerEmail: who!.email }
			});
		}
	});
	const ref = { railName: await railName(db, loop.railId), revision: loop.revision, message: loop.message };
	const mail = await deliver(
		chosen.map((who) => reviewRequestMail({ to: who!.email, requesterName: actor.name, loop: ref, note, reviewUrl: origin + reviewPath(loop.workspaceId, loop.id) }))
	);
	return { ...moved, requests: await requestsFor(db, loop.id), mail };
}

/**
 * Approves or sends back `loop` (loops.review refuses the author and wrong states), answers the
 * open requests (the decider's own with the decision, the others as superseded) and e-mails
 * the author the decision.
 */
export async function decide(db: Database, actor: Actor & { name: string }, loop: Loop, action: 'approve' | 'request-changes', note: string | undefined, origin: string) {
	const moved = await loops.review(db, actor, loop, action, note);
	const now = new Date();
	const mine: ReviewRequestStatus = action === 'approve' ? 'approved' : 'changes-requested';
	await db.transaction(async (tx) => {
		await tx
			.update(reviewRequest)
			.set({ status: sql`CASE WHEN ${reviewRequest.reviewerId} = ${actor.userId} THEN ${mine} ELSE 'superseded' END`, decidedAt: now })
			.where(and(eq(reviewRequest.loopId, loop.id), eq(reviewRequest.status, 'pending')));
	});
	let mail: MailOutcome = { sent: [], failed: [] };
	if (loop.authorId) {
		const [author] = await db.select({ email: user.email }).from(user).where(eq(user.id, loop.authorId)).limit(1);
		if (author) {
			const ref = { railName: await railName(db, loop.railId), revision: loop.revision, message: loop.message };
			mail = await deliver([
				reviewDecisionMail({ to: author.email, reviewerName: actor.name, loop: ref, approved: action === 'approve', note, reviewUrl: origin + reviewPath(loop.workspaceId, loop.id) })
			]);
		}
	}
	return { ...moved, requests: await requestsFor(db, loop.id), mail };
}

const queueColumns = {
	loopId: loopRevision.id,
	revision: loopRevision.revision,
	status: loopRevision.status,
	message: loopRevision.message,
	authorId: loopRevision.authorId,
	createdAt: loopRevision.createdAt,
	railId: rail.id,
	railName: rail.name,
	projectId: project.id,
	projectName: project.name
};

/**
 * The caller's review queue in one workspace: revisions they were asked to review (open ones
 * first, then their recent answers) and every other revision waiting in review.
 */
export async function queue(db: Database, workspaceId: string, userId: string) {
	const assigned = await db
		.select({ ...queueColumns, requestStatus: reviewRequest.status, requestedAt: reviewRequest.createdAt, decidedAt: reviewRequest.decidedAt, note: reviewRequest.note })
		.from(reviewRequest)
		.innerJoin(loopRevision, eq(loopRevision.id, reviewRequest.loopId))
		.innerJoin(rail, eq(rail.id, loopRevision.railId))
		.innerJoin(project, eq(project.id, rail.projectId))
		.where(and(eq(reviewRequest.workspaceId, workspaceId), eq(reviewRequest.reviewerId, userId)))
		.orderBy(sql`${reviewRequest.status} = 'pending' DESC`, desc(reviewRequest.createdAt))
		.limit(100);
	const seen = new Set(assigned.map((a) => a.loopId));
	const waiting = (
		await db
			.select(queueColumns)
			.from(loopRevision)
			.innerJoin(rail, eq(rail.id, loopRevision.railId))
			.innerJoin(project, eq(project.id, rail.projectId))
			.where(and(eq(loopRevision.workspaceId, workspaceId), eq(loopRevision.status, 'in-review')))
			.orderBy(desc(loopRevision.createdAt))
			.limit(100)
	).filter((w) => !seen.has(w.loopId));
	const authorIds = [...new Set([...assigned, ...waiting].map((r) => r.authorId).filter((x): x is string => !!x))];
	const names = authorIds.length ? await db.select({ id: user.id, name: user.name }).from(user).where(inArray(user.id, authorIds)) : [];
	const nameOf = (id: string | null) => names.find((n) => n.id === id)?.name ?? null;
	return {
		assigned: assigned.map((a) => ({ ...a, authorName: nameOf(a.authorId) })),
		waiting: waiting.map((w) => ({ ...w, authorName: nameOf(w.authorId) }))
	};
}

/** The newest approved revision of the rail older than `beforeRevision` (the diff's base: loops.diffBaseColumns). */
export async function lastApproved(db: Database, railId: string, beforeRevision: number) {
	const [row] = await db
		.select(loops.diffBaseColumns)
		.from(loopRevision)
		.where(and(eq(loopRevision.railId, railId), eq(loopRevision.status, 'approved'), lt(loopRevision.revision, beforeRevision)))
		.orderBy(desc(loopRevision.revision))
		.limit(1);
	return row ?? null;
}

