// Rails of a project: name, topology, operating point, corners, tolerances and margin targets
// (null = the workspace's). A PATCH is merged with the stored rail and validated whole, so the
// cross-field rules (vinMin ≤ vinNom, a buck steps down, ...) hold after every edit.
import { randomUUID } from 'node:crypto';
import { asc, count, eq, max } from 'drizzle-orm';
import type { z } from 'zod';
import type { Database } from '../db';
import { loopRevision, project, rail } from '../db/schema';
import type { Page, PageQuery } from '../http/request';
import { invalid } from '../http/errors';
import { railSchema, type RailInput, type railUpdateSchema } from '../../schemas/workspace';
import { railSpecSections } from '../../spec/railSpec';
import * as audit from './audit';
import { uniqueOr409 } from './errors';
import type { Actor, MarginTargets } from './types';
import type { Project } from './projects';

export type Rail = typeof rail.$inferSelect;

const FIELDS = ['name', 'topology', 'vout', 'vinNom', 'vinMin', 'vinMax', 'ioutNom', 'ioutMin', 'ioutMax', 'fsw', 'tolerances', 'marginTargets', 'notes'] as const;
const duplicate = 'a rail with this name already exists on the board';

function inputOf(r: Rail): RailInput {
	return Object.fromEntries(FIELDS.map((k) => [k, r[k]])) as unknown as RailInput;
}

/**
 * The API shape: the row plus the margin targets in force and `spec`, the verification spec a
 * new revision of the rail starts from (document sections: targets, corners, tolerances, spread).
 */
export function present(r: Rail, workspaceTargets: MarginTargets, latestRevision: number | null = null) {
	return {
		...r,
		spec: railSpecSections({ ...r, targets: r.marginTargets ?? workspaceTargets }),
		effectiveMarginTargets: r.marginTargets ?? workspaceTargets,
		latestRevision
	};
}

export async function list(db: Database, projectId: string, page: PageQuery) {
	const [rows, [{ total }]] = await Promise.all([
		db
			.select({ rail, latestRevision: max(loopRevision.revision) })
			.from(rail)
			.leftJoin(loopRevision, eq(loopRevision.railId, rail.id))
			.where(eq(rail.projectId, projectId))
			.groupBy(rail.id)
			.orderBy(asc(rail.name))
			.limit(page.limit)
			.offset(page.offset),
		db.select({ total: count() }).from(rail).where(eq(rail.projectId, projectId))
	]);
	return { items: rows, page: { ...page, total } } satisfies Page<unknown>;
}

/** Most rails one workspace list answers (`truncated` in the page total beyond). */
export const WORKSPACE_RAILS_MAX = 1000;

/** Every rail of a workspace with its board's name, by board then rail name: what a rail picker lists. */
export async function listInWorkspace(db: Database, workspaceId: string, page: PageQuery) {
	const [items, [{ total }]] = await Promise.all([
		db
			.select({ id: rail.id, name: rail.name, topology: rail.topology, fsw: rail.fsw, projectId: project.id, projectName: project.name })
			.from(rail)
			.innerJoin(project, eq(project.id, rail.projectId))
			.where(eq(rail.workspaceId, workspaceId))
			.orderBy(asc(project.name), asc(rail.name))
			.limit(page.limit)
			.offset(page.offset),
		db.select({ total: count() }).from(rail).where(eq(rail.workspaceId, workspaceId))
	]);
	return { items, page: { ...page, total } } satisfies Page<unknown>;
}

export async function get(db: Database, id: string): Promise<Rail | null> {
	const [row] = await db.select().from(rail).where(eq(rail.id, id)).limit(1);
	return row ?? null;
}

export async function latestRevision(db: Database, railId: string): Promise<number | null> {
	const [row] = await db.select({ latest: max(loopRevision.revision) }).from(loopRevision).where(eq(loopRevision.railId, railId));
	return row?.latest ?? null;
}

export async function create(db: Database, actor: Actor, owner: Project, input: RailInput): Promise<Rail> {
	const now = new Date();
	const row: Rail = {
		id: randomUUID(),
		workspaceId: owner.workspaceId,
		projectId: owner.id,
		...input,
		notes: input.notes ?? null,
		verdictFlag: null,
		createdBy: actor.userId,
		createdAt: now,
		updatedAt: now
	};
	await uniqueOr409(
		() =>
			db.transaction(async (tx) => {
				await tx.insert(rail).values(row);
				await audit.record(tx, {
					workspaceId: row.workspaceId,
					actor,
					action: 'rail.create',
					entityType: 'rail',
					entityId: row.id,
					after: { projectId: owner.id, name: row.name, topology: row.topology, vout: row.vout, vinNom: row.vinNom, ioutNom: row.ioutNom }
				});
			}),
		'name',
		duplicate
	);
	return row;
}

export async function update(db: Database, actor: Actor, existing: Rail, patch: z.infer<typeof railUpdateSchema>): Promise<Rail> {
	const before = inputOf(existing);
	const merged = { ...before, ...patch, tolerances: { ...before.tolerances, ...patch.tolerances } };
	const checked = railSchema.safeParse(merged);
	if (!checked.success) throw invalid(checked.error);
	const next: Rail = { ...existing, ...checked.data, notes: checked.data.notes ?? null, updatedAt: new Date() };
	await uniqueOr409(
		() =>
			db.transaction(async (tx) => {
				const { id: _id, workspaceId: _w, projectId: _p, createdAt: _c, createdBy: _b, ...set } = next;
				await tx.update(rail).set(set).where(eq(rail.id, existing.id));
				await audit.record(tx, {
					workspaceId: existing.workspaceId,
					actor,
					action: 'rail.update',
					entityType: 'rail',
					entityId: existing.id,
					...audit.diff(before, inputOf(next), [...FIELDS])
				});
			}),
		'name',
		duplicate
	);
	return next;
}

/** Clears the rail's "verdict changed" flag: someone has seen the new verdict. */
export async function acknowledgeFlag(db: Database, actor: Actor, existing: Rail): Promise<Rail> {
	if (!existing.verdictFlag) return existing;
	await db.transaction(async (tx) => {
		await tx.update(rail).set({ verdictFlag: null }).where(eq(rail.id, existing.id));
		await audit.record(tx, {
			workspaceId: existing.workspaceId,
			actor,
			action: 'rail.verdict-acknowledge',
			entityType: 'rail',
			entityId: existing.id,
			before: { verdictFlag: existing.verdictFlag as unknown as Record<string, unknown> },
			after: null
		});
	});
	return { ...existing, verdictFlag: null };
}

export async function remove(db: Database, actor: Actor, existing: Rail): Promise<void> {
	await db.transaction(async (tx) => {
		const [{ loops }] = await tx.select({ loops: count() }).from(loopRevision).where(eq(loopRevision.railId, existing.id));
		await tx.delete(rail).where(eq(rail.id, existing.id));
		await audit.record(tx, {
			workspaceId: existing.workspaceId,
			actor,
			action: 'rail.delete',
			entityType: 'rail',
			entityId: existing.id,
			before: { projectId: existing.projectId, name: existing.name, topology: existing.topology, loopRevisions: loops }
		});
	});
}
