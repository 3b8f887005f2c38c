// The audit log: one row per write (who, what, when, a before/after summary). Services call
// `record` inside the same transaction as the write, so a write without its trail never lands.
import { and, count, desc, eq, ne } from 'drizzle-orm';
import type { Database } from '../db';
import { auditLog } from '../db/schema';
import type { PageQuery, Page } from '../http/request';
import type { Actor, Executor } from './types';

export interface AuditEntry {
	workspaceId: string;
	actor: Actor | null;
	action: string;
	entityType: string;
	entityId: string;
	before?: Record<string, unknown> | null;
	after?: Record<string, unknown> | null;
}

export async function record(db: Executor, entry: AuditEntry): Promise<void> {
	await db.insert(auditLog).values({
		workspaceId: entry.workspaceId,
		actorId: entry.actor?.userId ?? null,
		actorEmail: entry.actor?.email ?? null,
		action: entry.action,
		entityType: entry.entityType,
		entityId: entry.entityId,
		before: entry.before ?? null,
		after: entry.after ?? null,
		createdAt: new Date()
	});
}

/** Only the fields that differ, as `{ before, after }` summaries. */
export function diff<T extends Record<string, unknown>>(before: T, after: T, keys: (keyof T)[]) {
	const b: Record<string, unknown> = {};
	const a: Record<string, unknown> = {};
	for (const key of keys) {
		if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) {
			b[key as string] = before[key];
			a[key as string] = after[key];
		}
	}
	return { before: b, after: a };
}

export async function list(
	db: Database,
	workspaceId: string,
	page: PageQuery,
	filter: { entityId?: string; withInvitations?: boolean } = {}
): Promise<Page<typeof auditLog.$inferSelect>> {
	const where = and(
		eq(auditLog.workspaceId, workspaceId),
		filter.entityId ? eq(auditLog.entityId, filter.entityId) : undefined,
		// An invitation's entry names the invited address and carries the id its acceptance link is made of.
		filter.withInvitations === false ? ne(auditLog.entityType, 'invitation') : undefined
	);
	const [items, [{ total }]] = await Promise.all([
		db.select().from(auditLog).where(where).orderBy(desc(auditLog.id)).limit(page.limit).offset(page.offset),
		db.select({ total: count() }).from(auditLog).where(where)
	]);
	return { items, page: { ...page, total } };
}
