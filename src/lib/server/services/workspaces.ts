// Workspaces (better-auth organizations), their settings and their members. Workspace
// creation writes the same rows better-auth's organization plugin writes (organization + an
// owner member), so both paths agree; invitations live in ./invitations.ts.
import { randomUUID } from 'node:crypto';
import { and, asc, eq, ne } from 'drizzle-orm';
import type { z } from 'zod';
import type { Database } from '../db';
import { member, organization, user, workspaceSetting } from '../db/schema';
import { ApiError } from '../http/errors';
import { DEFAULT_MARGIN_TARGETS, type workspaceCreateSchema, type workspaceUpdateSchema } from '../../schemas/workspace';
import type { Role } from '../authz/permissions';
import * as audit from './audit';
import { uniqueOr409 } from './errors';
import type { Actor, MarginTargets } from './types';

export type Workspace = typeof organization.$inferSelect;

/** The caller's workspaces with their role in each. */
export async function listForUser(db: Database, userId: string) {
	const rows = await db
		.select({ workspace: organization, role: member.role })
		.from(member)
		.innerJoin(organization, eq(organization.id, member.organizationId))
		.where(eq(member.userId, userId))
		.orderBy(asc(organization.name));
	return rows.map((r) => ({ id: r.workspace.id, name: r.workspace.name, slug: r.workspace.slug, createdAt: r.workspace.createdAt, role: r.role }));
}

export async function get(db: Database, id: string): Promise<Workspace | null> {
	const [row] = await db.select().from(organization).where(eq(organization.id, id)).limit(1);
	return row ?? null;
}

/** The margin targets rails of this workspace use unless they override them. */
export async function marginTargets(db: Database, workspaceId: string): Promise<MarginTargets> {
	const [row] = await db.select().from(workspaceSetting).where(eq(workspaceSetting.workspaceId, workspaceId)).limit(1);
	return row?.marginTargets ?? DEFAULT_MARGIN_TARGETS;
}

export async function create(db: Database, actor: Actor, input: z.infer<typeof workspaceCreateSchema>) {
	const now = new Date();
	const workspace: Workspace = { id: randomUUID(), name: input.name, slug: input.slug, logo: null, createdAt: now, metadata: null };
	await uniqueOr409(
		() =>
			db.transaction(async (tx) => {
				await tx.insert(organization).values(workspace);
				await tx.insert(member).values({ id: randomUUID(), organizationId: workspace.id, userId: actor.userId, role: 'owner', createdAt: now });
				await tx.insert(workspaceSetting).values({ workspaceId: workspace.id, marginTargets: DEFAULT_MARGIN_TARGETS });
				await audit.record(tx, {
					workspaceId: workspace.id,
					actor,
					action: 'workspace.create',
					entityType: 'workspace',
					entityId: workspace.id,
					after: { name: workspace.name, slug: workspace.slug }
				});
			}),
		'slug',
		'a workspace with this slug already exists'
	);
	return workspace;
}

export async function update(db: Database, actor: Actor, existing: Workspace, patch: z.infer<typeof workspaceUpdateSchema>) {
	const targetsBefore = await marginTargets(db, existing.id);
	await db.transaction(async (tx) => {
		if (patch.name !== undefined) await tx.update(organization).set({ name: patch.name }).where(eq(organization.id, existing.id));
		if (patch.marginTargets) {
			await tx
				.insert(workspaceSetting)
				.values({ workspaceId: existing.id, marginTargets: patch.marginTargets })
				.onDuplicateKeyUpdate({ set: { marginTargets: patch.marginTargets } });
		}
		const before = { name: existing.name, marginTargets: targetsBefore };
		const after = { name: patch.name ?? existing.name, marginTargets: patch.marginTargets ?? targetsBefore };
		await audit.record(tx, {
			workspaceId: existing.id,
			actor,
			action: 'workspace.update',
			entityType: 'workspace',
			entityId: existing.id,
			...audit.diff(before, after, ['name', 'marginTargets'])
		});
	});
	return { ...existing, name: patch.name ?? existing.name };
}

export async function members(db: Database, workspaceId: string) {
	return db
		.select({ id: member.id, userId: user.id, name: user.name, email: user.email, role: member.role, joinedAt: member.createdAt })
		.from(member)
		.innerJoin(user, eq(user.id, member.userId))
		.where(eq(member.organizationId, workspaceId))
		.orderBy(asc(user.name));
}

export type Member = typeof member.$inferSelect;

export async function getMember(db: Database, workspaceId: string, memberId: string): Promise<Member | null> {
	const [row] = await db
		.select()
		.from(member)
		.where(and(eq(member.id, memberId), eq(member.organizationId, workspaceId)))
		.limit(1);
	return row ?? null;
}

/** A workspace always keeps at least one owner. */
async function assertAnotherOwner(db: Database, target: Member) {
	if (target.role !== 'owner') return;
	const others = await db
		.select({ id: member.id })
		.from(member)
		.where(and(eq(member.organizationId, target.organizationId), eq(member.role, 'owner'), ne(member.id, target.id)))
		.limit(1);
	if (others.length === 0) throw new ApiError(422, 'last-owner', 'a workspace needs at least one owner; make someone else owner first');
}

export async function setMemberRole(db: Database, actor: Actor, target: Member, role: Role) {
	if (role !== 'owner') await assertAnotherOwner(db, target);
	await db.transaction(async (tx) => {
		await tx.update(member).set({ role }).where(eq(member.id, target.id));
		await audit.record(tx, {
			workspaceId: target.organizationId,
			actor,
			action: 'member.updateRole',
			entityType: 'member',
			entityId: target.id,
			before: { userId: target.userId, role: target.role },
			after: { userId: target.userId, role }
		});
	});
	return { ...target, role };
}

export async function removeMember(db: Database, actor: Actor, target: Member) {
	await assertAnotherOwner(db, target);
	await db.transaction(async (tx) => {
		await tx.delete(member).where(eq(member.id, target.id));
		await audit.record(tx, {
			workspaceId: target.organizationId,
			actor,
			action: 'member.remove',
			entityType: 'member',
			entityId: target.id,
			before: { userId: target.userId, role: target.role }
		});
	});
}
