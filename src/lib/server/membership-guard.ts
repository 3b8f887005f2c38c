// Role changes and removals go through one place: /api/v1/workspaces/{id}/members/{memberId}, whose
// service (services/workspaces.ts) decides the last-owner rule under a row lock inside the same
// transaction as the write. better-auth's organization plugin offers the same changes at
// /api/auth/organization/{update-member-role,remove-member,leave}, where its owner count is read
// outside any transaction (two owners demoting each other at once could both succeed) and no audit
// entry is written; this plugin refuses them, for HTTP callers and in-process auth.api calls alike.
import type { BetterAuthPlugin } from 'better-auth';
import { APIError, createAuthMiddleware } from 'better-auth/api';

export const MEMBERSHIP_PATHS = ['/organization/update-member-role', '/organization/remove-member', '/organization/leave'] as const;

export function membershipGuard(): BetterAuthPlugin {
	return {
		id: 'loopwright-membership-guard',
		hooks: {
			before: [
				{
					matcher: (ctx) => (MEMBERSHIP_PATHS as readonly (string | undefined)[]).includes(ctx.path),
					handler: createAuthMiddleware(async () => {
						throw new APIError('FORBIDDEN', {
							code: 'USE_WORKSPACE_API',
							message: 'change roles and remove members with PATCH or DELETE /api/v1/workspaces/{id}/members/{memberId}; a workspace always keeps one owner'
						});
					})
				}
			]
		}
	};
}
