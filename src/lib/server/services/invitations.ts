// Invitations to a workspace. Written to better-auth's `invitation` table, so acceptance goes
// through its organization plugin (which checks that the signed-in e-mail matches). Sending
// here rather than through the plugin endpoint lets API tokens invite too.
import { randomUUID } from 'node:crypto';
import { and, desc, eq } from 'drizzle-orm';
import type { Database } from '../db';
import { invitation, member, user } from '../db/schema';
import { ApiError } from '../http/errors';
import { sendMail } from '../mail/transport';
import { invitationMail } from '../mail/messages';
import { countInvitation } from '../invitation-limits';
import type { Role } from '../../authz';
import * as audit from './audit';
import type { Actor } from './types';
import type { Workspace } from './workspaces';

const VALID_DAYS = 7;
/** Newest invitations one list answer holds (pending ones are among the newest: they expire after VALID_DAYS). */
export const INVITATION_LIST_LIMIT = 200;

export type Invitation = typeof invitation.$inferSelect;

export function list(db: Database, workspaceId: string) {
	return db
		.select({ id: invitation.id, email: invitation.email, role: invitation.role, status: invitation.status, expiresAt: invitation.expiresAt, createdAt: invitation.createdAt })
		.from(invitation)
		.where(eq(invitation.organizationId, workspaceId))
		.orderBy(desc(invitation.createdAt))
		.limit(INVITATION_LIST_LIMIT);
}

export async function get(db: Database, workspaceId: string, id: string): Promise<Invitation | null> {
	const [row] = await db
		.select()
		.from(invitation)
		.where(and(eq(invitation.id, id), eq(invitation.organizationId, workspaceId)))
		.limit(1);
	return row ?? null;
}

/**
 * Creates a pending invitation (cancelling an earlier pending one to the same address) and
 * e-mails the link. 409 when that address already belongs to a member; 429 when the inviter or
 * the workspace sent its hourly share of invitations (../invitation-limits.ts).
 */
export async function invite(
	db: Database,
	actor: Actor & { name: string },
	workspace: Workspace,
	input: { email: string; role: Role },
	acceptBaseUrl: string
): Promise<Invitation> {
	const email = input.email.toLowerCase();
	const existing = await db
		.select({ id: member.id })
		.from(member)
		.innerJoin(user, eq(user.id, member.userId))
		.where(and(eq(member.organizationId, workspace.id), eq(user.email, email)))
		.limit(1);
	if (existing.length > 0) throw new ApiError(409, 'already-member', `${email} is already a member`, { email: 'already a member' });
	const refused = await countInvitation(db, { workspaceId: workspace.id, inviterId: actor.userId });
	if (refused) throw new ApiError(429, 'too-many-invitations', refused.message, undefined, { retryAfterS: refused.waitS });

	const now = new Date();
	const row: Invitation = {
		id: randomUUID(),
		organizationId: workspace.id,
		email,
		role: input.role,
		status: 'pending',
		expiresAt: new Date(now.getTime() + VALID_DAYS * 86_400_000),
		createdAt: now,
		inviterId: actor.userId
	};
	await db.transaction(async (tx) => {
		await tx
			.update(invitation)
			.set({ status: 'canceled' })
			.where(and(eq(invitation.organizationId, workspace.id), eq(invitation.email, email), eq(invitation.status, 'pending')));
		await tx.insert(invitation).values(row);
		await audit.record(tx, {
			workspaceId: workspace.id,
			actor,
			action: 'member.invite',
			entityType: 'invitation',
			entityId: row.id,
			after: { email, role: input.role }
		});
	});
	await sendMail(
		invitationMail({ to: email, workspaceName: workspace.name, inviterName: actor.name, role: input.role, acceptUrl: `${acceptBaseUrl}/invitations/${row.id}` })
	);
	return row;
}

export async function cancel(db: Database, actor: Actor, row: Invitation): Promise<void> {
	if (row.status !== 'pending') throw new ApiError(422, 'not-pending', `the invitation is ${row.status}`);
	await db.transaction(async (tx) => {
		await tx.update(invitation).set({ status: 'canceled' }).where(eq(invitation.id, row.id));
		await audit.record(tx, {
			workspaceId: row.organizationId,
			actor,
			action: 'member.invite.cancel',
			entityType: 'invitation',
			entityId: row.id,
			before: { email: row.email, status: row.status },
			after: { status: 'canceled' }
		});
	});
}
