// Sign-in throttle: a better-auth plugin that counts failed e-mail sign-ins per client address
// and account, and per client address over all accounts, and refuses further attempts with 429
// until the window ends. Its hooks run for every call of the sign-in endpoint, through the HTTP
// handler (/api/auth/sign-in/email) and in-process (auth.api.signInEmail from the sign-in form),
// which better-auth's own rate limiter (HTTP handler only) does not see. Keyed by the trusted
// client address (CLIENT_IP_HEADER, set by hooks.server.ts) so one client cannot lock out another.
import type { BetterAuthPlugin } from 'better-auth';
import { APIError, createAuthMiddleware, getIP, isAPIError } from 'better-auth/api';

/** Set by the request hook from the socket (or adapter-node's ADDRESS_HEADER); any client value is overwritten. */
export const CLIENT_IP_HEADER = 'x-loopwright-client-ip';

export interface Window {
	maxFailures: number;
	windowSeconds: number;
}

/** Failed passwords before a pause, per client address + account and per client address alone. [common practice: a handful of tries per account, a wider cap per address] */
export const SIGN_IN_LIMITS: { perAccount: Window; perAddress: Window } = {
	perAccount: { maxFailures: 5, windowSeconds: 15 * 60 },
	perAddress: { maxFailures: 30, windowSeconds: 15 * 60 }
};

/** Upper bound on remembered keys, so a flood of made-up addresses cannot grow memory without end. */
const MAX_KEYS = 100_000;

interface Count {
	failures: number;
	resetsAt: number;
}

/** Failure counts in fixed windows that start at the first failure; one Node process, kept in memory. */
export class FailureCounter {
	private readonly counts = new Map<string, Count>();

	/** Seconds until `key` may try again, or 0 when it is not blocked. */
	blockedFor(key: string, rule: Window, now = Date.now()): number {
		const count = this.counts.get(key);
		if (!count || now >= count.resetsAt) return 0;
		return count.failures >= rule.maxFailures ? Math.ceil((count.resetsAt - now) / 1000) : 0;
	}

	fail(key: string, rule: Window, now = Date.now()) {
		const count = this.counts.get(key);
		if (count && now < count.resetsAt) count.failures += 1;
		else {
			if (this.counts.size >= MAX_KEYS) this.prune(now);
			this.counts.set(key, { failures: 1, resetsAt: now + rule.windowSeconds * 1000 });
		}
	}

	clear(key: string) {
		this.counts.delete(key);
	}

	private prune(now: number) {
		for (const [key, count] of this.counts) if (now >= count.resetsAt) this.counts.delete(key);
		// Still full of live keys: drop the oldest insertions (Map keeps insertion order).
		for (const key of this.counts.keys()) {
			if (this.counts.size < MAX_KEYS) break;
			this.counts.delete(key);
		}
	}
}

const SIGN_IN_PATH = '/sign-in/email';

type HookContext = { headers?: Headers; context: { options: Parameters<typeof getIP>[1] } };

/** The trusted client address of a better-auth call (CLIENT_IP_HEADER via advanced.ipAddress), or one shared key when unknown. */
export function clientAddressOf(ctx: HookContext): string {
	return (ctx.headers && getIP(ctx.headers, ctx.context.options)) || 'unknown-address';
}

export function signInThrottle(limits = SIGN_IN_LIMITS): BetterAuthPlugin {
	const counter = new FailureCounter();
	const keys = (ctx: HookContext & { body?: unknown }) => {
		const address = clientAddressOf(ctx);
		const email = String((ctx.body as { email?: unknown } | undefined)?.email ?? '').trim().toLowerCase();
		return { address: `address|${address}`, account: `account|${address}|${email}` };
	};
	return {
		id: 'loopwright-sign-in-throttle',
		hooks: {
			before: [
				{
					matcher: (ctx) => ctx.path === SIGN_IN_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const key = keys(ctx);
						const wait = Math.max(counter.blockedFor(key.account, limits.perAccount), counter.blockedFor(key.address, limits.perAddress));
						if (wait > 0) {
							throw new APIError(
								'TOO_MANY_REQUESTS',
								{ code: 'TOO_MANY_ATTEMPTS', message: `Too many sign-in attempts. Try again in ${Math.ceil(wait / 60)} min.` },
								{ 'retry-after': String(wait) }
							);
						}
					})
				}
			],
			after: [
				{
					matcher: (ctx) => ctx.path === SIGN_IN_PATH,
					handler: createAuthMiddleware(async (ctx) => {
						const key = keys(ctx);
						const returned = ctx.context.returned;
						if (isAPIError(returned)) {
							// Only wrong credentials count; a malformed request or a server fault is not a guess.
							if (returned.statusCode === 401) {
								counter.fail(key.account, limits.perAccount);
								counter.fail(key.address, limits.perAddress);
							}
						} else if (returned !== undefined) counter.clear(key.account);
					})
				}
			]
		}
	};
}
