// Projects (boards or products) of a workspace. Reads return rows; writes record an audit row
// in the same transaction. Access checks happen in the route, before any of these run.
import { randomUUID } from 'node:crypto';
import { asc, count, eq } from 'drizzle-orm';
import type { z } from 'zod';
import type { Database } from '../db';
import { project, rail } from '../db/schema';
import type { Page, PageQuery } from '../http/request';
import type { projectCreateSchema, projectUpdateSchema } from '../../schemas/workspace';
import * as audit from './audit';
import { uniqueOr409 } from './errors';
import type { Actor } from './types';

export type Project = typeof project.$inferSelect;
const summary = (p: Project) => ({ name: p.name, description: p.description });
const duplicate = 'a project with this name already exists in the workspace';

export async function list(db: Database, workspaceId: string, page: PageQuery): Promise<Page<Project & { railCount: number }>> {
	const [rows, [{ total }]] = await Promise.all([
		db
			.select({ project, railCount: count(rail.id) })
			.from(project)
			.leftJoin(rail, eq(rail.projectId, project.id))
			.where(eq(project.workspaceId, workspaceId))
			.groupBy(project.id)
			.orderBy(asc(project.name))
			.limit(page.limit)
			.offset(page.offset),
		db.select({ total: count() }).from(project).where(eq(project.workspaceId, workspaceId))
	]);
	return { items: rows.map((r) => ({ ...r.project, railCount: r.railCount })), page: { ...page, total } };
}

/** The project with this id in any workspace; the caller checks membership of `workspaceId`. */
export async function get(db: Database, id: string): Promise<Project | null> {
	const [row] = await db.select().from(project).where(eq(project.id, id)).limit(1);
	return row ?? null;
}

export async function create(
	db: Database,
	actor: Actor,
	workspaceId: string,
	input: z.infer<typeof projectCreateSchema>
): Promise<Project> {
	const now = new Date();
	const row: Project = {
		id: randomUUID(),
		workspaceId,
		name: input.name,
		description: input.description ?? null,
		createdBy: actor.userId,
		createdAt: now,
		updatedAt: now
	};
	await uniqueOr409(
		() =>
			db.transaction(async (tx) => {
				await tx.insert(project).values(row);
				await audit.record(tx, { workspaceId, actor, action: 'project.create', entityType: 'project', entityId: row.id, after: summary(row) });
			}),
		'name',
		duplicate
	);
	return row;
}

export async function update(db: Database, actor: Actor, existing: Project, patch: z.infer<typeof projectUpdateSchema>): Promise<Project> {
	const next: Project = { ...existing, ...patch, description: patch.description === undefined ? existing.description : patch.description ?? null, updatedAt: new Date() };
	await uniqueOr409(
		() =>
			db.transaction(async (tx) => {
				await tx.update(project).set({ name: next.name, description: next.description, updatedAt: next.updatedAt }).where(eq(project.id, existing.id));
				await audit.record(tx, {
					workspaceId: existing.workspaceId,
					actor,
					action: 'project.update',
					entityType: 'project',
					entityId: existing.id,
					...audit.diff(summary(existing), summary(next), ['name', 'description'])
				});
			}),
		'name',
		duplicate
	);
	return next;
}

/** Deletes the project with its rails and their loops (foreign keys cascade). */
export async function remove(db: Database, actor: Actor, existing: Project): Promise<void> {
	await db.transaction(async (tx) => {
		const [{ rails }] = await tx.select({ rails: count() }).from(rail).where(eq(rail.projectId, existing.id));
		await tx.delete(project).where(eq(project.id, existing.id));
		await audit.record(tx, {
			workspaceId: existing.workspaceId,
			actor,
			action: 'project.delete',
			entityType: 'project',
			entityId: existing.id,
			before: { ...summary(existing), rails }
		});
	});
}
