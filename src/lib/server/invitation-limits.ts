// Invitation e-mails per workspace and per inviter in fixed one-hour windows, counted in MariaDB
// (./rate-limit.ts) by every path that sends one: our API (services/invitations.ts) and
// better-auth's /api/auth/organization/invite-member (the organization hook in auth-core.ts).
// Without a cap an owner could use the app to mail any address, with a workspace and inviter
// name of their choosing, as fast as they like.
import type { Database } from './db';
import { limitFromEnv } from './account-request-throttle';
import { bucketOf, overLimit, RateLimiter, type Window } from './rate-limit';

export interface InvitationLimits {
	perWorkspace: Window;
	perInviter: Window;
}

/**
 * [common practice: a team is invited a few at a time; a burst of dozens in an hour is a script].
 * INVITATION_LIMIT_PER_WORKSPACE_PER_HOUR and INVITATION_LIMIT_PER_INVITER_PER_HOUR raise them.
 */
export function invitationLimits(env: Record<string, string | undefined> = process.env): InvitationLimits {
	return {
		perWorkspace: { max: limitFromEnv(env, 'INVITATION_LIMIT_PER_WORKSPACE_PER_HOUR', 20), windowSeconds: 3600 },
		perInviter: { max: limitFromEnv(env, 'INVITATION_LIMIT_PER_INVITER_PER_HOUR', 10), windowSeconds: 3600 }
	};
}

export interface InvitationRefusal {
	scope: 'workspace' | 'inviter';
	waitS: number;
	message: string;
}

/** Counts one invitation e-mail; a refusal (nothing counted) when the inviter or the workspace is at its cap. */
export async function countInvitation(db: Database, who: { workspaceId: string; inviterId: string }, limits = invitationLimits()): Promise<InvitationRefusal | null> {
	const counter = new RateLimiter(db);
	const inviter = bucketOf('invite-inviter', who.inviterId);
	const inviterWait = overLimit(await counter.hit(inviter, limits.perInviter), limits.perInviter);
	if (inviterWait > 0) {
		await counter.refund(inviter);
		return { scope: 'inviter', waitS: inviterWait, message: `you sent ${limits.perInviter.max} invitations this hour; try again in ${Math.ceil(inviterWait / 60)} min` };
	}
	const workspace = bucketOf('invite-workspace', who.workspaceId);
	const workspaceWait = overLimit(await counter.hit(workspace, limits.perWorkspace), limits.perWorkspace);
	if (workspaceWait > 0) {
		await Promise.all([counter.refund(workspace), counter.refund(inviter)]);
		return { scope: 'workspace', waitS: workspaceWait, message: `this workspace sent ${limits.perWorkspace.max} invitations this hour; try again in ${Math.ceil(workspaceWait / 60)} min` };
	}
	return null;
}
