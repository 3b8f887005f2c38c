// Workspaces (better-auth organizations), their settings and their members. Workspace
// creation writes the same rows better-auth's organization plugin writes (organization + an
// owner member), so both paths agree; invitations live in ./invitations.ts.
import { randomUUID } from 'node:crypto';
import { and, asc, eq } from 'drizzle-orm';
import type { z } from 'zod';
import type { Database } from '../db';
import { member, organization, user, workspaceSetting } from '../db/schema';
import { ApiError, forbidden, notFound } from '../http/errors';
import { DEFAULT_MARGIN_TARGETS, type workspaceCreateSchema, type workspaceUpdateSchema } from '../../schemas/workspace';
import { can, type Role } from '../../authz';
import * as audit from './audit';
import { uniqueOr409 } from './errors';
import type { Actor, Executor, MarginTargets } from './types';

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
		.orderBy(asc(user.name))
		.limit(MEMBER_LIST_LIMIT);
}

/** Members one list answer holds: far beyond a design team, a bound on the answer's size. */
export const MEMBER_LIST_LIMIT = 1000;

export type Member = typeof member.$inferSelect;

export async function getMember(db: Database, workspaceId: string, memberId: string): Promise<Member | null> {
	const [row] = await db
		.select()
		.from(member)
		.where(and(eq(member.id, memberId), eq(member.organizationId, workspaceId)))
		.limit(1);
	return row ?? null;
}

/**
 * The workspace's member rows, locked until the transaction ends (SELECT … FOR UPDATE on the
 * organisation index). Every role change and removal takes this lock first, so two of them on one
 * workspace run one after the other and each decides on rows no one else can change meanwhile.
 */
async function lockMembers(tx: Executor, workspaceId: string) {
	return tx.select({ id: member.id, userId: member.userId, role: member.role }).from(member).where(eq(member.organizationId, workspaceId)).for('update');
}

type LockedMember = Awaited<ReturnType<typeof lockMembers>>[number];

/**
 * Under the lock: the actor may still do this (a concurrent change may have demoted or removed
 * them since the request's role check), the target still exists, and a workspace always keeps at
 * least one owner after the change.
 */
function decideUnderLock(rows: LockedMember[], actor: Actor, targetId: string, action: 'member.updateRole' | 'member.remove', roleAfter: Role | null) {
	const actorRow = rows.find((r) => r.userId === actor.userId);
	if (!actorRow) throw notFound('member');
	if (!can(actorRow.role, action)) throw forbidden(action);
	const target = rows.find((r) => r.id === targetId);
	if (!target) throw notFound('member');
	const ownersAfter = rows.filter((r) => (r.id === target.id ? roleAfter : r.role) === 'owner').length;
	if (ownersAfter === 0) {
		// A role change names the field it refuses, so the members screen shows it at the role.
		const fields = action === 'member.updateRole' ? { role: 'the last owner stays owner: make someone else owner first' } : undefined;
		throw new ApiError(422, 'last-owner', 'a workspace needs at least one owner; make someone else owner first', fields);
	}
	return target;
}

export async function setMemberRole(db: Database, actor: Actor, target: Member, role: Role) {
	return db.transaction(async (tx) => {
		const current = decideUnderLock(await lockMembers(tx, target.organizationId), actor, target.id, 'member.updateRole', role);
		await tx.update(member).set({ role }).where(eq(member.id, target.id));
		await audit.record(tx, {
			workspaceId: target.organizationId,
			actor,
			action: 'member.updateRole',
			entityType: 'member',
			entityId: target.id,
			before: { userId: current.userId, role: current.role },
			after: { userId: current.userId, role }
		});
		return { ...target, role };
	});
}

export async function removeMember(db: Database, actor: Actor, target: Member) {
	await db.transaction(async (tx) => {
		const current = decideUnderLock(await lockMembers(tx, target.organizationId), actor, target.id, 'member.remove', null);
		await tx.delete(member).where(eq(member.id, target.id));
		await audit.record(tx, {
			workspaceId: target.organizationId,
			actor,
			action: 'member.remove',
			entityType: 'member',
			entityId: target.id,
			before: { userId: current.userId, role: current.role }
		});
	});
}
