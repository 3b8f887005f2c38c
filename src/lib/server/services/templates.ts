// Templates: workspace-shared compensator strategies (kind, placement target, part series)
// that engineers start new loops from.
import { randomUUID } from 'node:crypto';
import { and, asc, count, eq, like, or, sql, type SQL } from 'drizzle-orm';
import type { z } from 'zod';
import type { Database } from '../db';
import { template } from '../db/schema';
import { ApiError, notFound } from '../http/errors';
import type { Page, PageQuery } from '../http/request';
import type { templateSchema, templateUpdateSchema } from '../../schemas/workspace';
import * as audit from './audit';
import { uniqueOr409 } from './errors';
import type { Actor } from './types';

export type Template = typeof template.$inferSelect;
const summary = (t: Template) => ({ name: t.name, description: t.description, topology: t.topology, compensator: t.compensator });
const duplicate = 'a template with this name already exists in the workspace';

/** `q` (case-insensitive) in the name, description, topology, network kind or control method; an empty search matches all. */
function matching(q: string | undefined): SQL | undefined {
	const needle = q?.trim().toLowerCase();
	if (!needle) return undefined;
	const pattern = `%${needle.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
	return or(
		like(sql`lower(${template.name})`, pattern),
		like(sql`lower(coalesce(${template.description}, ''))`, pattern),
		like(sql`lower(coalesce(${template.topology}, ''))`, pattern),
		like(sql`lower(coalesce(json_unquote(json_extract(${template.compensator}, '$.kind')), ''))`, pattern),
		// The control method in words ("peak current", "voltage"); a template without one is voltage mode.
		like(sql`lower(replace(coalesce(json_unquote(json_extract(${template.compensator}, '$.control')), 'voltage'), '-', ' '))`, pattern)
	);
}

export async function list(db: Database, workspaceId: string, page: PageQuery, q?: string): Promise<Page<Template>> {
	const where = and(eq(template.workspaceId, workspaceId), matching(q));
	const [items, [{ total }]] = await Promise.all([
		db.select().from(template).where(where).orderBy(asc(template.name)).limit(page.limit).offset(page.offset),
		db.select({ total: count() }).from(template).where(where)
	]);
	return { items, page: { ...page, total } };
}

export async function get(db: Database, id: string): Promise<Template | null> {
	const [row] = await db.select().from(template).where(eq(template.id, id)).limit(1);
	return row ?? null;
}

export async function create(db: Database, actor: Actor, workspaceId: string, input: z.infer<typeof templateSchema>): Promise<Template> {
	const now = new Date();
	const row: Template = {
		id: randomUUID(),
		workspaceId,
		name: input.name,
		description: input.description ?? null,
		topology: input.topology,
		compensator: input.compensator,
		createdBy: actor.userId,
		createdAt: now,
		updatedAt: now
	};
	await uniqueOr409(
		() =>
			db.transaction(async (tx) => {
				await tx.insert(template).values(row);
				await audit.record(tx, { workspaceId, actor, action: 'template.create', entityType: 'template', entityId: row.id, after: summary(row) });
			}),
		'name',
		duplicate
	);
	return row;
}

/**
 * Applies an edit made on the version `patch.baseUpdatedAt`. The row is locked (SELECT … FOR UPDATE)
 * and its updatedAt compared inside the write's transaction: an edit on a version someone else has
 * changed since is refused with 409 `stale-template`, naming the current version, and changes nothing.
 * Each write moves updatedAt forward by at least 1 ms, so two versions never share a time.
 */
export async function update(db: Database, actor: Actor, existing: Template, patch: z.infer<typeof templateUpdateSchema>): Promise<Template> {
	return uniqueOr409(
		() =>
			db.transaction(async (tx) => {
				const [current] = await tx.select().from(template).where(eq(template.id, existing.id)).for('update');
				if (!current) throw notFound('template');
				if (current.updatedAt.getTime() !== new Date(patch.baseUpdatedAt).getTime()) {
					throw new ApiError(
						409,
						'stale-template',
						`the template was changed at ${current.updatedAt.toISOString()}, after the version you edited (${patch.baseUpdatedAt}); reload it, merge your change and send baseUpdatedAt ${current.updatedAt.toISOString()}`,
						undefined,
						{ current }
					);
				}
				const next: Template = {
					...current,
					name: patch.name ?? current.name,
					description: patch.description === undefined ? current.description : (patch.description ?? null),
					topology: patch.topology === undefined ? current.topology : patch.topology,
					compensator: patch.compensator ?? current.compensator,
					updatedAt: new Date(Math.max(Date.now(), current.updatedAt.getTime() + 1))
				};
				await tx
					.update(template)
					.set({ name: next.name, description: next.description, topology: next.topology, compensator: next.compensator, updatedAt: next.updatedAt })
					.where(eq(template.id, current.id));
				await audit.record(tx, {
					workspaceId: current.workspaceId,
					actor,
					action: 'template.update',
					entityType: 'template',
					entityId: current.id,
					...audit.diff(summary(current), summary(next), ['name', 'description', 'topology', 'compensator'])
				});
				return next;
			}),
		'name',
		duplicate
	);
}

export async function remove(db: Database, actor: Actor, existing: Template): Promise<void> {
	await db.transaction(async (tx) => {
		await tx.delete(template).where(eq(template.id, existing.id));
		await audit.record(tx, { workspaceId: existing.workspaceId, actor, action: 'template.delete', entityType: 'template', entityId: existing.id, before: summary(existing) });
	});
}
