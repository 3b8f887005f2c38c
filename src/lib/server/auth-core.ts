// better-auth configured for Loopwright, without any SvelteKit import so set-up scripts (seed)
// can use it too. src/lib/server/auth.ts adds the SvelteKit cookie plugin for the server.
// E-mail + password, sessions in MariaDB, workspaces via the organization plugin with our roles.
import { betterAuth, type BetterAuthPlugin } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { APIError } from 'better-auth/api';
import { organization } from 'better-auth/plugins';
import { ac, roles } from './authz/better-auth-roles';
import { isRole, ROLES } from './authz/permissions';
import * as authSchema from './db/auth-schema';
import type { Database } from './db';
import { isProduction } from './env';
import { sendMail } from './mail/transport';
import { invitationMail, passwordResetMail } from './mail/messages';
import * as audit from './services/audit';

const DEV_SECRET = 'loopwright-development-secret-not-for-production-use';

/** The public origin of the app: ORIGIN, else http://127.0.0.1:$PORT (default port 3000). */
export function appOrigin(): string {
	return (process.env.ORIGIN || `http://127.0.0.1:${process.env.PORT || 3000}`).replace(/\/$/, '');
}

function authSecret(): string {
	const secret = process.env.BETTER_AUTH_SECRET;
	// The development default is public (it is in this file): never sign production sessions with it.
	if (secret === DEV_SECRET && isProduction()) throw new Error('BETTER_AUTH_SECRET must not be the development default in production');
	if (secret) return secret;
	if (isProduction()) throw new Error('BETTER_AUTH_SECRET must be set in production');
	return DEV_SECRET;
}

/** Rejects any role string that is not exactly one of ours (the plugin also accepts `admin`, `member`, lists). */
function assertOurRole(role: string | undefined) {
	if (!isRole(role)) {
		throw new APIError('BAD_REQUEST', {
			code: 'INVALID_ROLE',
			message: `role must be one of ${ROLES.join(', ')}`
		});
	}
}

export function createAuth(db: Database, extraPlugins: BetterAuthPlugin[] = []) {
	const baseURL = appOrigin();
	return betterAuth({
		appName: 'Loopwright',
		baseURL,
		secret: authSecret(),
		trustedOrigins: [baseURL],
		database: drizzleAdapter(db, { provider: 'mysql', schema: authSchema }),
		telemetry: { enabled: false },
		emailAndPassword: {
			enabled: true,
			minPasswordLength: 10,
			revokeSessionsOnPasswordReset: true,
			resetPasswordTokenExpiresIn: 3600,
			async sendResetPassword({ user, url }) {
				await sendMail(passwordResetMail({ to: user.email, name: user.name, resetUrl: url }));
			}
		},
		plugins: [
			organization({
				ac,
				roles,
				creatorRole: 'owner',
				allowUserToCreateOrganization: true,
				teams: { enabled: false },
				invitationExpiresIn: 7 * 24 * 3600,
				cancelPendingInvitationsOnReInvite: true,
				async sendInvitationEmail(data) {
					await sendMail(
						invitationMail({
							to: data.email,
							workspaceName: data.organization.name,
							inviterName: data.inviter.user.name,
							role: data.role,
							acceptUrl: `${baseURL}/invitations/${data.id}`
						})
					);
				},
				organizationHooks: {
					beforeCreateInvitation: async ({ invitation }) => assertOurRole(invitation.role),
					beforeAddMember: async ({ member }) => assertOurRole(member.role),
					beforeUpdateMemberRole: async ({ newRole }) => assertOurRole(newRole),
					afterAcceptInvitation: async ({ invitation, member, user }) =>
						audit.record(db, {
							workspaceId: invitation.organizationId,
							actor: { userId: user.id, email: user.email },
							action: 'member.join',
							entityType: 'member',
							entityId: member.id,
							after: { userId: user.id, role: member.role, invitationId: invitation.id }
						})
				}
			}),
			...extraPlugins
		]
	});
}

export type Auth = ReturnType<typeof createAuth>;
