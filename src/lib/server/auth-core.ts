// better-auth configured for Loopwright, without any SvelteKit import so set-up scripts (seed)
// can use it too. src/lib/server/auth.ts adds the SvelteKit cookie plugin for the server.
// E-mail + password, sessions in MariaDB, workspaces via the organization plugin with our roles.
import { betterAuth, type BetterAuthPlugin } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { APIError } from 'better-auth/api';
import { organization } from 'better-auth/plugins';
import { ac, roles } from './authz/better-auth-roles';
import { isRole, ROLES } from '../authz';
import * as authSchema from './db/auth-schema';
import type { Database } from './db';
import { isProduction } from './env';
import { sendMail } from './mail/transport';
import { existingAccountMail, invitationMail, passwordResetMail, verifyEmailMail } from './mail/messages';
import * as audit from './services/audit';
import * as tokens from './services/tokens';
import { CLIENT_IP_HEADER, signInThrottle } from './sign-in-throttle';
import { accountRequestThrottle, accountRequestLimits } from './account-request-throttle';
import { countInvitation } from './invitation-limits';
import { membershipGuard } from './membership-guard';

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

/**
 * Seconds a signed session may be trusted from its signed cookie copy before the database is asked
 * again (better-auth's session cookie cache). 0 turns the cache off. Within this time a session
 * ended elsewhere (sign-out on another device, password reset, expiry, a deleted session row)
 * still opens the app for a client holding a copy of both cookies; workspace roles are read from
 * the database on every request regardless. Default 60 s (SESSION_CACHE_SECONDS).
 */
export function sessionCacheSeconds(): number {
	const raw = process.env.SESSION_CACHE_SECONDS;
	const seconds = raw === undefined || raw === '' ? 60 : Number(raw);
	if (!Number.isInteger(seconds) || seconds < 0) throw new Error('SESSION_CACHE_SECONDS must be a whole number of seconds (0 turns the cache off)');
	return seconds;
}

/** The invitation is for the signed-in user's own, confirmed address (checked again here besides the plugin's own checks). */
function assertInvitee(invitation: { email: string }, user: { email: string; emailVerified?: boolean | null }) {
	if (invitation.email.toLowerCase() !== user.email.toLowerCase()) {
		throw new APIError('FORBIDDEN', { code: 'NOT_THE_INVITEE', message: 'This invitation is for another e-mail address.' });
	}
	if (!user.emailVerified) {
		throw new APIError('FORBIDDEN', { code: 'EMAIL_NOT_VERIFIED', message: 'Confirm your e-mail address first (the link is in your mail), then accept.' });
	}
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

/** Hours a confirmation link works. [common practice: a day, so a link read the next morning still works] */
export const VERIFY_LINK_HOURS = 24;

export interface AuthLimits {
	accountRequests?: ReturnType<typeof accountRequestLimits>;
}

export function createAuth(db: Database, extraPlugins: BetterAuthPlugin[] = [], limits: AuthLimits = {}) {
	const baseURL = appOrigin();
	return betterAuth({
		appName: 'Loopwright',
		baseURL,
		secret: authSecret(),
		trustedOrigins: [baseURL],
		database: drizzleAdapter(db, { provider: 'mysql', schema: authSchema }),
		telemetry: { enabled: false },
		session: { cookieCache: { enabled: sessionCacheSeconds() > 0, maxAge: sessionCacheSeconds() } },
		// The client address for better-auth's rate limiter and session records: only the header our
		// request hook writes from the socket (or adapter-node's ADDRESS_HEADER), never one a client sent.
		advanced: { ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] } },
		emailAndPassword: {
			enabled: true,
			minPasswordLength: 10,
			// No session before the address is confirmed: signing up with someone else's address
			// gets the squatter nothing (and an invitation to that address stays theirs).
			requireEmailVerification: true,
			revokeSessionsOnPasswordReset: true,
			resetPasswordTokenExpiresIn: 3600,
			async sendResetPassword({ user, url }) {
				await sendMail(passwordResetMail({ to: user.email, name: user.name, resetUrl: url }));
			},
			// A sign-up with an address that has an account answers like any other (no way to probe
			// who has one); the owner hears about it by mail.
			async onExistingUserSignUp({ user }) {
				await sendMail(existingAccountMail({ to: user.email, name: user.name, signInUrl: `${baseURL}/sign-in`, resetUrl: `${baseURL}/forgot-password` }));
			},
			// Whoever had the account may also hold its API tokens: a reset ends those with the sessions.
			async onPasswordReset({ user }) {
				await tokens.revokeAll(db, user.id);
			}
		},
		emailVerification: {
			sendOnSignUp: true,
			// A sign-in with the right password but an unconfirmed address mails a fresh link.
			sendOnSignIn: true,
			autoSignInAfterVerification: true,
			expiresIn: VERIFY_LINK_HOURS * 3600,
			async sendVerificationEmail({ user, url }) {
				await sendMail(verifyEmailMail({ to: user.email, name: user.name, verifyUrl: url }));
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
				// Only the confirmed owner of the invited address may accept (or reject) it.
				requireEmailVerificationOnInvitation: true,
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
					beforeCreateInvitation: async ({ invitation, inviter }) => {
						assertOurRole(invitation.role);
						const refused = await countInvitation(db, { workspaceId: invitation.organizationId, inviterId: inviter.id });
						if (refused) throw new APIError('TOO_MANY_REQUESTS', { code: 'TOO_MANY_INVITATIONS', message: refused.message }, { 'retry-after': String(refused.waitS) });
					},
					beforeAcceptInvitation: async ({ invitation, user }) => assertInvitee(invitation, user),
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
			// Failed sign-ins per client address and account, also for the sign-in form's in-process call.
			signInThrottle(db),
			// Sign-ups and reset-link requests per client address, also for the forms' in-process calls.
			accountRequestThrottle(db, limits.accountRequests),
			// Role changes and removals only through our API, which keeps one owner under a row lock.
			membershipGuard(),
			...extraPlugins
		]
	});
}

export type Auth = ReturnType<typeof createAuth>;
