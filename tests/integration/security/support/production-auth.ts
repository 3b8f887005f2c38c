// Run as a child process with NODE_ENV=production (better-auth reads it once, at import):
// builds the app's own better-auth configuration (auth-core.ts) and reports, as one JSON line,
// what production would do: whether it starts without a secret or with the development
// default, and how the sign-in endpoint answers a burst of wrong passwords.
import { createAuth } from '../../../../src/lib/server/auth-core';
import { createDatabase } from '../../../../src/lib/server/db';
import { CLIENT_IP_HEADER } from '../../../../src/lib/server/sign-in-throttle';

const mode = process.argv[2];
const { db, pool } = createDatabase();

function tryCreate(): string {
	try {
		createAuth(db);
		return 'started';
	} catch (error) {
		return `refused: ${(error as Error).message}`;
	}
}

/** `ip`: the address the request hook writes (CLIENT_IP_HEADER); `forwarded`: an X-Forwarded-For a client sent itself. */
async function signInBurst(count: number, ip: string | null, email: string, forwarded?: (i: number) => string) {
	const auth = createAuth(db);
	const statuses: number[] = [];
	for (let i = 0; i < count; i++) {
		const headers: Record<string, string> = { 'content-type': 'application/json', origin: process.env.ORIGIN! };
		if (ip) headers[CLIENT_IP_HEADER] = ip;
		if (forwarded) headers['x-forwarded-for'] = forwarded(i);
		const response = await auth.handler(
			new Request(`${process.env.ORIGIN}/api/auth/sign-in/email`, { method: 'POST', headers, body: JSON.stringify({ email, password: 'wrong-password-0' }) })
		);
		statuses.push(response.status);
	}
	return statuses;
}

let result: unknown;
if (mode === 'secret') {
	// authSecret() reads the environment on each call, so one process can try all three settings.
	const outcomes: Record<string, string> = {};
	for (const [label, value] of Object.entries({ unset: undefined, development: 'loopwright-development-secret-not-for-production-use', real: 'a-real-secret-from-the-environment-0123456789' })) {
		if (value === undefined) delete process.env.BETTER_AUTH_SECRET;
		else process.env.BETTER_AUTH_SECRET = value;
		outcomes[label] = tryCreate();
	}
	result = outcomes;
}
else {
	// Fresh addresses and accounts on every run: the sign-in counts outlive a run in the test database.
	const run = Math.random().toString(36).slice(2, 10);
	const host = () => 1 + Math.floor(Math.random() * 254);
	const a = await signInBurst(5, `203.0.113.${host()}`, `first-${run}@example.test`);
	const b = await signInBurst(2, `192.0.2.${host()}`, `second-${run}@example.test`);
	// Without the hook's header the client has no address of its own: a new X-Forwarded-For on
	// every request does not buy a fresh bucket.
	const c = await signInBurst(4, null, `third-${run}@example.test`, (i) => `198.51.100.${i + 1}`);
	result = { sameClient: a, otherClient: b, rotatingForwardedFor: c };
}
console.log(JSON.stringify(result));
await pool.end();
