// Account-request throttle: a better-auth plugin that caps account creation and password-reset
// requests per client address (and reset requests per e-mail) in fixed windows, and answers 429
// beyond them. Like the sign-in throttle its hooks run for the forms' in-process calls
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
		resetPerEmail: { max: 5, windowSeconds: 3600 },
		resetPerAddress: { max: 20, windowSeconds: 3600 }
	};
}

const SIGN_UP_PATH = '/sign-up/email';
const RESET_PATH = '/request-password-reset';

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
					})
				},
				{
					matcher: (ctx) => ctx.path === RESET_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const perAddress = await counter.hit(bucketOf('reset-address', clientAddressOf(ctx)), limits.resetPerAddress);
						const addressWait = overLimit(perAddress, limits.resetPerAddress);
						if (addressWait > 0) throw tooMany('password-reset requests', 'from this network', addressWait);
						const perEmail = await counter.hit(bucketOf('reset-email', emailOf(ctx)), limits.resetPerEmail);
						const emailWait = overLimit(perEmail, limits.resetPerEmail);
						if (emailWait > 0) throw tooMany('password-reset requests', 'for this e-mail', emailWait);
					})
				}
			]
		}
	};
}
