// Account-request throttle: a better-auth plugin that caps account creation, password-reset and
// confirmation-mail requests per client address and per e-mail in fixed windows, and answers 429
// beyond them (each of these mails someone, so each could flood a mailbox). Like the sign-in throttle its hooks run for the forms' in-process calls
// (auth.api.signUpEmail, auth.api.requestPasswordReset) as well as for /api/auth, which better-auth's
// own limiter (HTTP handler only) does not see. Every attempt counts, not only failed ones: the
// abuse is volume (accounts made by a script, a mailbox flooded with reset links). The counts live
// in MariaDB (./rate-limit.ts), shared by every app instance.
import type { BetterAuthPlugin } from 'better-auth';
import { APIError, createAuthMiddleware } from 'better-auth/api';
import type { Database } from './db';
import { bucketOf, overLimit, RateLimiter, type Window } from './rate-limit';
import { clientAddressOf, emailOf } from './sign-in-throttle';

export interface AccountRequestLimits {
	signUpPerAddress: Window;
	/** A sign-up with a taken address mails its owner a note, so sign-ups count per e-mail too. */
	signUpPerEmail: Window;
	/** Reset links and fresh confirmation links (better-auth's /send-verification-email), each per e-mail and per client address. */
	resetPerEmail: Window;
	resetPerAddress: Window;
}

/** A positive whole number from the environment, else the default. */
export function limitFromEnv(env: Record<string, string | undefined>, name: string, fallback: number): number {
	const value = Number(env[name]);
	return env[name] && Number.isInteger(value) && value > 0 ? value : fallback;
}

/**
 * [common practice: an office behind one address onboards a team at once, so sign-ups get a wider
 * cap than reset links, which one person needs once or twice]. SIGN_UP_LIMIT_PER_HOUR raises the
 * sign-up cap (an onboarding day; the test suites, which create hundreds of users from 127.0.0.1).
 * Reset links are capped per e-mail over all client addresses, so rotating addresses does not
 * flood one mailbox, and per client address over all e-mails.
 */
export function accountRequestLimits(env: Record<string, string | undefined> = process.env): AccountRequestLimits {
	return {
		signUpPerAddress: { max: limitFromEnv(env, 'SIGN_UP_LIMIT_PER_HOUR', 20), windowSeconds: 3600 },
		signUpPerEmail: { max: 5, windowSeconds: 3600 },
		resetPerEmail: { max: 5, windowSeconds: 3600 },
		resetPerAddress: { max: 20, windowSeconds: 3600 }
	};
}

const SIGN_UP_PATH = '/sign-up/email';
/** Requests that mail a link to a named address, and what the 429 calls them. */
const MAIL_REQUESTS: Record<string, string> = {
	'/request-password-reset': 'password-reset requests',
	'/send-verification-email': 'confirmation e-mails'
};

function tooMany(what: string, source: string, waitS: number): APIError {
	return new APIError(
		'TOO_MANY_REQUESTS',
		{ code: 'TOO_MANY_REQUESTS', message: `Too many ${what} ${source}. Try again in ${Math.ceil(waitS / 60)} min.` },
		{ 'retry-after': String(waitS) }
	);
}

export function accountRequestThrottle(db: Database, limits = accountRequestLimits()): BetterAuthPlugin {
	const counter = new RateLimiter(db);
	return {
		id: 'loopwright-account-request-throttle',
		hooks: {
			before: [
				{
					matcher: (ctx) => ctx.path === SIGN_UP_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const count = await counter.hit(bucketOf('sign-up-address', clientAddressOf(ctx)), limits.signUpPerAddress);
						const wait = overLimit(count, limits.signUpPerAddress);
						if (wait > 0) throw tooMany('sign-ups', 'from this network', wait);
						const perEmail = await counter.hit(bucketOf('sign-up-email', emailOf(ctx)), limits.signUpPerEmail);
						const emailWait = overLimit(perEmail, limits.signUpPerEmail);
						if (emailWait > 0) throw tooMany('sign-ups', 'for this e-mail', emailWait);
					})
				},
				{
					matcher: (ctx) => Object.hasOwn(MAIL_REQUESTS, ctx.path ?? ''),
					handler: createAuthMiddleware(async (ctx) => {
						const what = MAIL_REQUESTS[ctx.path];
						const kind = ctx.path === '/request-password-reset' ? 'reset' : 'confirm';
						const perAddress = await counter.hit(bucketOf(`${kind}-address`, clientAddressOf(ctx)), limits.resetPerAddress);
						const addressWait = overLimit(perAddress, limits.resetPerAddress);
						if (addressWait > 0) throw tooMany(what, 'from this network', addressWait);
						const perEmail = await counter.hit(bucketOf(`${kind}-email`, emailOf(ctx)), limits.resetPerEmail);
						const emailWait = overLimit(perEmail, limits.resetPerEmail);
						if (emailWait > 0) throw tooMany(what, 'for this e-mail', emailWait);
					})
				}
			]
		}
	};
}
