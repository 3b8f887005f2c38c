// Saved loops: append-only numbered revisions per rail (r1, r2, ...). Saving names the
// revision the edit started from; if another revision landed meanwhile the save is refused
// with 409 and the current revision, so no edit is silently lost. Only the review status of
// a revision changes after it is written: draft → in-review → approved | changes-requested.
import { randomUUID } from 'node:crypto';
import { and, asc, count, desc, eq, lt, max, sql } from 'drizzle-orm';
import type { Database } from '../db';
import { loopComment, loopRevision, rail, user, type LoopStatus } from '../db/schema';
import { designDocumentSchema, SCHEMA_VERSION } from '../../engine/contract/designSchema';
import { zodFields } from '../../engine/contract/errors';
import type { Verification } from '../../engine/verify/types';
import { ApiError } from '../http/errors';
import type { Page, PageQuery } from '../http/request';
import * as audit from './audit';
import { completeSpec } from './rail-spec';
import { verifyDocument } from './verify';
import type { Actor } from './types';
import type { Rail } from './rails';

/** A stored revision as the app reads and writes it (verdict_headline is the database's, read only by the board). */
export type LoopRevision = Omit<typeof loopRevision.$inferSelect, 'verdictHeadline'>;
export type ReviewAction = 'request-review' | 'approve' | 'request-changes';

/** Which status each review action leads to, and from which statuses it may start. */
export const TRANSITIONS: Record<ReviewAction, { from: LoopStatus[]; to: LoopStatus }> = {
	'request-review': { from: ['draft', 'changes-requested'], to: 'in-review' },
	approve: { from: ['in-review'], to: 'approved' },
	'request-changes': { from: ['in-review'], to: 'changes-requested' }
};

export const summaryColumns = {
	id: loopRevision.id,
	workspaceId: loopRevision.workspaceId,
	railId: loopRevision.railId,
	revision: loopRevision.revision,
	schemaVersion: loopRevision.schemaVersion,
	message: loopRevision.message,
	status: loopRevision.status,
	engineVersion: loopRevision.engineVersion,
	authorId: loopRevision.authorId,
	authorName: user.name,
	createdAt: loopRevision.createdAt,
	statusChangedAt: loopRevision.statusChangedAt,
	statusChangedBy: loopRevision.statusChangedBy,
	templateId: loopRevision.templateId
};

/**
 * The stored verdict without its per-corner list (hundreds of rows): what a list, the board
 * table and a flag need. The whole verdict comes with one revision (`get`).
 */
export const verdictColumn = sql<Verification | null>`JSON_REMOVE(${loopRevision.verification}, '$.corners.list')`.mapWith((v: unknown) =>
	typeof v === 'string' ? (JSON.parse(v) as Verification) : ((v ?? null) as Verification | null)
);

export type LoopSummary = Omit<LoopRevision, 'design' | 'verification' | 'switchingCheck'> & { authorName: string | null; verification: Verification | null };

export async function list(db: Database, railId: string, page: PageQuery): Promise<Page<LoopSummary>> {
	const [items, [{ total }]] = await Promise.all([
		db
			.select({ ...summaryColumns, verification: verdictColumn })
			.from(loopRevision)
			.leftJoin(user, eq(user.id, loopRevision.authorId))
			.where(eq(loopRevision.railId, railId))
			.orderBy(desc(loopRevision.revision))
			.limit(page.limit)
			.offset(page.offset),
		db.select({ total: count() }).from(loopRevision).where(eq(loopRevision.railId, railId))
	]);
	return { items, page: { ...page, total } };
}

export async function get(db: Database, id: string) {
	const [row] = await db
		.select({ ...summaryColumns, design: loopRevision.design, verification: loopRevision.verification, switchingCheck: loopRevision.switchingCheck })
		.from(loopRevision)
		.leftJoin(user, eq(user.id, loopRevision.authorId))
		.where(eq(loopRevision.id, id))
		.limit(1);
	return row ?? null;
}

function brief(r: Pick<LoopRevision, 'id' | 'revision' | 'status' | 'message' | 'createdAt' | 'authorId'>) {
	return { id: r.id, revision: r.revision, status: r.status, message: r.message, createdAt: r.createdAt, authorId: r.authorId };
}

/**
 * What a "what changed" comparison reads of an earlier revision: its design and its verdict's
 * headline (status and rows, all verdictDiff compares), never the whole ~80 kB verdict.
 */
export const diffBaseColumns = {
	id: loopRevision.id,
	revision: loopRevision.revision,
	status: loopRevision.status,
	design: loopRevision.design,
	verification: loopRevision.verdictHeadline
};

/** The rail's revision just before `revision` (whatever its status), for "what changed". */
export async function previous(db: Database, railId: string, revision: number) {
	const [row] = await db
		.select(diffBaseColumns)
		.from(loopRevision)
		.where(and(eq(loopRevision.railId, railId), lt(loopRevision.revision, revision)))
		.orderBy(desc(loopRevision.revision))
		.limit(1);
	return row ?? null;
}

/**
 * Validates the design against the engine's contract, completes its verification spec from
 * the rail (sections it lacks), verifies it with the engine and appends revision N+1 with the
 * verdict, provided `baseRevision` is still the latest (null/0 = none yet). Saving clears the
 * rail's "verdict changed" flag: the new revision has a verdict of its own.
 */
export async function save(
	db: Database,
	actor: Actor,
	owner: Rail,
	input: { baseRevision: number | null; design: unknown; message: string; templateId?: string | null }
): Promise<LoopRevision> {
	const parsed = designDocumentSchema.safeParse(input.design);
	if (!parsed.success) {
		throw new ApiError(400, 'invalid-design', 'the design document failed validation', zodFields(parsed.error, ['design']));
	}
	if (parsed.data.plant.topology !== owner.topology) {
		throw new ApiError(422, 'topology-mismatch', `the rail is a ${owner.topology}; the design is a ${parsed.data.plant.topology}`, {
			'design.plant.topology': `must be ${owner.topology} for this rail`
		});
	}
	const design = await completeSpec(db, owner, input.design as Record<string, unknown>);
	// In the analysis pool (the saver's budget), before the transaction: the rail lock is held only for the write.
	const verification = await verifyDocument(design, actor.userId);
	if ('error' in verification) {
		const fields = Object.fromEntries(Object.entries(verification.error.fields).map(([k, v]) => [`design.${k}`, v]));
		throw new ApiError(422, verification.error.code, `the design cannot be verified: ${verification.error.message}`, fields);
	}
	const base = input.baseRevision ?? 0;

	return db.transaction(async (tx) => {
		// Lock the rail row: concurrent saves to one rail queue here and see each other's revision.
		await tx.select({ id: rail.id }).from(rail).where(eq(rail.id, owner.id)).for('update');
		const [{ latest }] = await tx.select({ latest: max(loopRevision.revision) }).from(loopRevision).where(eq(loopRevision.railId, owner.id));
		const current = latest ?? 0;
		if (base !== current) {
			const [head] = await tx.select().from(loopRevision).where(and(eq(loopRevision.railId, owner.id), eq(loopRevision.revision, current)));
			throw new ApiError(
				409,
				'stale-revision',
				`r${current} was saved after r${base}; reload it, merge your change and save again with baseRevision ${current}`,
				undefined,
				{ currentRevision: current, current: head ? { ...brief(head), design: head.design } : null }
			);
		}
		const row: LoopRevision = {
			id: randomUUID(),
			workspaceId: owner.workspaceId,
			railId: owner.id,
			revision: current + 1,
			schemaVersion: SCHEMA_VERSION,
			design,
			verification,
			switchingCheck: null,
			engineVersion: verification.engineVersion,
			message: input.message,
			status: 'draft',
			authorId: actor.userId,
			createdAt: new Date(),
			statusChangedAt: null,
			statusChangedBy: null,
			templateId: input.templateId ?? null
		};
		await tx.insert(loopRevision).values(row);
		await tx.update(rail).set({ verdictFlag: null }).where(eq(rail.id, owner.id));
		await audit.record(tx, {
			workspaceId: owner.workspaceId,
			actor,
			action: 'loop.save',
			entityType: 'loop',
			entityId: row.id,
			before: current ? { revision: current } : null,
			after: {
				railId: owner.id,
				revision: row.revision,
				message: row.message,
				verdict: verification.status,
				engineVersion: verification.engineVersion
			}
		});
		return row;
	});
}

export async function review(
	db: Database,
	actor: Actor,
	loop: Pick<LoopRevision, 'id' | 'workspaceId' | 'status' | 'revision' | 'railId'> & { authorId?: string | null },
	action: ReviewAction,
	comment?: string
) {
	const rule = TRANSITIONS[action];
	// Sign-off needs a second pair of eyes: the author never decides on their own revision.
	if (action !== 'request-review' && 'authorId' in loop && loop.authorId === actor.userId) {
		throw new ApiError(403, 'own-revision', 'you wrote this revision; another reviewer must decide on it');
	}
	if (!rule.from.includes(loop.status)) {
		throw new ApiError(422, 'invalid-transition', `cannot ${action} a revision that is ${loop.status}`, { action: `allowed from ${rule.from.join(' or ')}` });
	}
	const now = new Date();
	await db.transaction(async (tx) => {
		// Conditional on the status we read, so two reviewers cannot both move the same revision.
		const [result] = await tx
			.update(loopRevision)
			.set({ status: rule.to, statusChangedAt: now, statusChangedBy: actor.userId })
			.where(and(eq(loopRevision.id, loop.id), eq(loopRevision.status, loop.status)));
		if (result.affectedRows === 0) throw new ApiError(409, 'status-changed', 'the status changed meanwhile; reload the revision');
		if (comment) {
			await tx.insert(loopComment).values({ id: randomUUID(), workspaceId: loop.workspaceId, loopId: loop.id, authorId: actor.userId, body: comment, createdAt: now });
		}
		await audit.record(tx, {
			workspaceId: loop.workspaceId,
			actor,
			action: `loop.${action}`,
			entityType: 'loop',
			entityId: loop.id,
			before: { status: loop.status },
			after: { status: rule.to, revision: loop.revision, ...(comment ? { comment: comment.slice(0, 200) } : {}) }
		});
	});
	return { ...loop, status: rule.to, statusChangedAt: now, statusChangedBy: actor.userId };
}

export function comments(db: Database, loopId: string) {
	return db
		.select({ id: loopComment.id, body: loopComment.body, freqHz: loopComment.freqHz, authorId: loopComment.authorId, authorName: user.name, createdAt: loopComment.createdAt })
		.from(loopComment)
		.leftJoin(user, eq(user.id, loopComment.authorId))
		.where(eq(loopComment.loopId, loopId))
		.orderBy(asc(loopComment.createdAt));
}

export async function addComment(db: Database, actor: Actor, loop: Pick<LoopRevision, 'id' | 'workspaceId'>, body: string, freqHz: number | null = null) {
	const row = { id: randomUUID(), workspaceId: loop.workspaceId, loopId: loop.id, authorId: actor.userId, body, freqHz, createdAt: new Date() };
	await db.transaction(async (tx) => {
		await tx.insert(loopComment).values(row);
		await audit.record(tx, { workspaceId: loop.workspaceId, actor, action: 'loop.comment', entityType: 'loop', entityId: loop.id, after: { commentId: row.id, body: body.slice(0, 200), ...(freqHz !== null ? { freqHz } : {}) } });
	});
	return row;
}
