// Sign-in throttle: a better-auth plugin that counts failed e-mail sign-ins per client address
// and account, and per client address over all accounts, and refuses further attempts with 429
// until the window ends. Its hooks run for every call of the sign-in endpoint, through the HTTP
// handler (/api/auth/sign-in/email) and in-process (auth.api.signInEmail from the sign-in form),
// which better-auth's own rate limiter (HTTP handler only) does not see. Keyed by the trusted
// client address (CLIENT_IP_HEADER, set by hooks.server.ts) so one client cannot lock out another.
// The counts live in MariaDB (./rate-limit.ts), so every app instance sees the same ones.
import type { BetterAuthPlugin } from 'better-auth';
import { APIError, createAuthMiddleware, getIP, isAPIError } from 'better-auth/api';
import type { Database } from './db';
import { bucketOf, overLimit, RateLimiter, type Window } from './rate-limit';

/** Set by the request hook from the socket (or adapter-node's ADDRESS_HEADER); any client value is overwritten. */
export const CLIENT_IP_HEADER = 'x-loopwright-client-ip';

/** Failed passwords before a pause, per client address + account and per client address alone. [common practice: a handful of tries per account, a wider cap per address] */
export const SIGN_IN_LIMITS: { perAccount: Window; perAddress: Window } = {
	perAccount: { max: 5, windowSeconds: 15 * 60 },
	perAddress: { max: 30, windowSeconds: 15 * 60 }
};

const SIGN_IN_PATH = '/sign-in/email';

type HookContext = { headers?: Headers; context: { options: Parameters<typeof getIP>[1] } };

/** The trusted client address of a better-auth call (CLIENT_IP_HEADER via advanced.ipAddress), or one shared key when unknown. */
export function clientAddressOf(ctx: HookContext): string {
	return (ctx.headers && getIP(ctx.headers, ctx.context.options)) || 'unknown-address';
}

/** The e-mail a better-auth call names in its body, trimmed and lower-cased ('' when none). */
export function emailOf(ctx: { body?: unknown }): string {
	return String((ctx.body as { email?: unknown } | undefined)?.email ?? '').trim().toLowerCase();
}

function tooMany(waitS: number): APIError {
	return new APIError(
		'TOO_MANY_REQUESTS',
		{ code: 'TOO_MANY_ATTEMPTS', message: `Too many sign-in attempts. Try again in ${Math.ceil(waitS / 60)} min.` },
		{ 'retry-after': String(waitS) }
	);
}

/**
 * Every attempt is counted before the password is checked (so parallel guesses cannot all pass a
 * check made before any of them failed); the after-hook takes the count back for attempts that
 * were no wrong password: a success (which also clears the account's count), a malformed request,
 * an unconfirmed address, a server fault.
 */
export function signInThrottle(db: Database, limits = SIGN_IN_LIMITS): BetterAuthPlugin {
	const counter = new RateLimiter(db);
	const buckets = (ctx: HookContext & { body?: unknown }) => {
		const address = clientAddressOf(ctx);
		return { address: bucketOf('sign-in-address', address), account: bucketOf('sign-in-account', address, emailOf(ctx)) };
	};
	return {
		id: 'loopwright-sign-in-throttle',
		hooks: {
			before: [
				{
					matcher: (ctx) => ctx.path === SIGN_IN_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const bucket = buckets(ctx);
						const address = await counter.hit(bucket.address, limits.perAddress);
						const addressWait = overLimit(address, limits.perAddress);
						if (addressWait > 0) throw tooMany(addressWait);
						const account = await counter.hit(bucket.account, limits.perAccount);
						const accountWait = overLimit(account, limits.perAccount);
						if (accountWait > 0) {
							// Refused before any password check: no guess for the address's count.
							await counter.refund(bucket.address);
							throw tooMany(accountWait);
						}
					})
				}
			],
			after: [
				{
					matcher: (ctx) => ctx.path === SIGN_IN_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const bucket = buckets(ctx);
						const returned = ctx.context.returned;
						// Only wrong credentials keep their count; a malformed request or a server fault is not a guess.
						if (isAPIError(returned) && returned.statusCode === 401) return;
						if (isAPIError(returned) && returned.statusCode === 429) return;
						await counter.refund(bucket.address);
						if (isAPIError(returned) || returned === undefined) await counter.refund(bucket.account);
						else await counter.clear(bucket.account);
					})
				}
			]
		}
	};
}
