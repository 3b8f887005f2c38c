// Account-request throttle: a better-auth plugin that caps account creation and password-reset
// requests per client address (and reset requests per address and e-mail) in fixed windows, and
// answers 429 beyond them. Like the sign-in throttle its hooks run for the forms' in-process calls
// (auth.api.signUpEmail, auth.api.requestPasswordReset) as well as for /api/auth, which better-auth's
// own limiter (HTTP handler only) does not see. Every attempt counts, not only failed ones: the
// abuse is volume (accounts made by a script, a mailbox flooded with reset links).
import type { BetterAuthPlugin } from 'better-auth';
import { APIError, createAuthMiddleware } from 'better-auth/api';
import { clientAddressOf, FailureCounter, type Window } from './sign-in-throttle';

export interface AccountRequestLimits {
	signUpPerAddress: Window;
	resetPerAddressAndEmail: Window;
	resetPerAddress: Window;
}

/**
 * [common practice: an office behind one address onboards a team at once, so sign-ups get a wider
 * cap than reset links, which one person needs once or twice]. SIGN_UP_LIMIT_PER_HOUR raises the
 * sign-up cap (an onboarding day; the test suites, which create hundreds of users from 127.0.0.1).
 */
export function accountRequestLimits(env: Record<string, string | undefined> = process.env): AccountRequestLimits {
	const signUps = Number(env.SIGN_UP_LIMIT_PER_HOUR);
	return {
		signUpPerAddress: { maxFailures: Number.isInteger(signUps) && signUps > 0 ? signUps : 20, windowSeconds: 3600 },
		resetPerAddressAndEmail: { maxFailures: 5, windowSeconds: 3600 },
		resetPerAddress: { maxFailures: 20, windowSeconds: 3600 }
	};
}

const SIGN_UP_PATH = '/sign-up/email';
const RESET_PATH = '/request-password-reset';

function tooMany(what: string, waitS: number): APIError {
	return new APIError(
		'TOO_MANY_REQUESTS',
		{ code: 'TOO_MANY_REQUESTS', message: `Too many ${what} from this network. Try again in ${Math.ceil(waitS / 60)} min.` },
		{ 'retry-after': String(waitS) }
	);
}

export function accountRequestThrottle(limits = accountRequestLimits()): BetterAuthPlugin {
	const counter = new FailureCounter();
	return {
		id: 'loopwright-account-request-throttle',
		hooks: {
			before: [
				{
					matcher: (ctx) => ctx.path === SIGN_UP_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const key = `sign-up|${clientAddressOf(ctx)}`;
						const wait = counter.blockedFor(key, limits.signUpPerAddress);
						if (wait > 0) throw tooMany('sign-ups', wait);
						counter.fail(key, limits.signUpPerAddress);
					})
				},
				{
					matcher: (ctx) => ctx.path === RESET_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const address = clientAddressOf(ctx);
						const email = String((ctx.body as { email?: unknown } | undefined)?.email ?? '').trim().toLowerCase();
						const perEmail = `reset|${address}|${email}`;
						const perAddress = `reset|${address}`;
						const wait = Math.max(counter.blockedFor(perEmail, limits.resetPerAddressAndEmail), counter.blockedFor(perAddress, limits.resetPerAddress));
						if (wait > 0) throw tooMany('password-reset requests', wait);
						counter.fail(perEmail, limits.resetPerAddressAndEmail);
						counter.fail(perAddress, limits.resetPerAddress);
					})
				}
			]
		}
	};
}
