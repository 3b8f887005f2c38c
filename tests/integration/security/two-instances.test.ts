// Two app instances behind one public address, one MariaDB: the documented scale path. Each
// instance is a process of its own (so nothing is shared but the database), behind a small load
// balancer that keeps the Host header and the client's address; each request names the instance
// it goes to, alternating. A session made on one is honoured on the
// other and ends on both; the sign-in, sign-up, reset-link and invitation limits count the
// requests of both instances together (with counters in one process's memory, each instance
// would allow the full limit again).
import '../support/env';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { accountRequestLimits } from '../../../src/lib/server/account-request-throttle';
import { SIGN_IN_LIMITS } from '../../../src/lib/server/sign-in-throttle';
import { servedApp, startBalancer, startInstance, type Instance } from '../support/app';
import { Client, PASSWORD, signUp, uniqueEmail } from '../support/client';
import { createWorkspace } from '../support/fixtures';
import { freePort } from '../support/mail-fake';
import { freshLoopback, postFromAddress } from './support/loopback';

const app = servedApp();
/** Small caps for these two instances (their env), so the test stays short. */
const SIGN_UPS = 3;
const INVITATIONS = 3;
let instances: Instance[] = [];
let balancer: { close(): Promise<void> } | null = null;
/** The address users see (the balancer's); both instances take it for their own (ORIGIN). */
let publicOrigin = '';

beforeAll(async () => {
	const port = await freePort();
	publicOrigin = `http://127.0.0.1:${port}`;
	const env = { ORIGIN: publicOrigin, BETTER_AUTH_URL: publicOrigin, SIGN_UP_LIMIT_PER_HOUR: String(SIGN_UPS), INVITATION_LIMIT_PER_INVITER_PER_HOUR: String(INVITATIONS) };
	instances = await Promise.all([startInstance(env), startInstance(env)]);
	balancer = await startBalancer(port, instances.map((i) => i.url));
}, 240_000);

afterAll(async () => {
	await balancer?.close();
	await Promise.all(instances.map((i) => i.stop()));
});

/** Headers sending a request to the instance its turn falls on: 0, 1, 0, 1, … */
const on = (turn: number) => ({ 'x-instance': String(turn % 2) });
/** A client of the public address whose requests go to the instance of `turn`, holding `cookie`. */
function clientOn(turn: number, cookie = ''): Client {
	const client = new Client(publicOrigin);
	client.headers = on(turn);
	client.cookie = cookie;
	return client;
}

describe('two instances, one database', () => {
	it('a session made on one instance is honoured on the other and ends on both', async () => {
		const user = await signUp(app.origin, 'two-sessions');
		const first = clientOn(0);
		expect((await first.post('/api/auth/sign-in/email', { email: user.email, password: PASSWORD })).status).toBe(200);
		const second = clientOn(1, first.cookie);
		expect((await second.get('/api/v1/me')).body.user.email).toBe(user.email);
		expect((await second.post('/api/auth/sign-out', {})).status).toBe(200);
		// After the session cookie cache (SESSION_CACHE_SECONDS, 2 s in tests) the copy on the first instance is refused too.
		await new Promise((r) => setTimeout(r, Number(process.env.SESSION_CACHE_SECONDS) * 1000 + 700));
		expect((await first.get('/api/v1/me')).status).toBe(401);
	}, 60_000);

	it('wrong passwords sent to both instances count together', async () => {
		const user = await signUp(app.origin, 'two-sign-in');
		const from = freshLoopback();
		const attempt = (turn: number, password: string) =>
			postFromAddress(publicOrigin, from, '/api/auth/sign-in/email', 'json', { email: user.email, password }, on(turn));
		for (let i = 0; i < SIGN_IN_LIMITS.perAccount.max; i++) expect((await attempt(i, 'wrong-password-0')).status).toBe(401);
		// Either instance now refuses, the right password included.
		expect((await attempt(0, PASSWORD)).status).toBe(429);
		expect((await attempt(1, PASSWORD)).status).toBe(429);
	}, 60_000);

	it('sign-ups from one client count together', async () => {
		const from = freshLoopback();
		const signUpOn = (turn: number) =>
			postFromAddress(publicOrigin, from, '/api/auth/sign-up/email', 'json', { email: uniqueEmail(`two-up${turn}`), password: PASSWORD, name: 'Two' }, on(turn));
		for (let i = 0; i < SIGN_UPS; i++) expect((await signUpOn(i)).status).toBe(200);
		expect((await signUpOn(SIGN_UPS)).status).toBe(429);
		expect((await signUpOn(SIGN_UPS + 1)).status).toBe(429);
	}, 60_000);

	it('reset-link requests for one e-mail count together', async () => {
		const email = uniqueEmail('two-reset');
		const resetOn = (turn: number) =>
			postFromAddress(publicOrigin, freshLoopback(), '/api/auth/request-password-reset', 'json', { email, redirectTo: '/reset-password' }, on(turn));
		const max = accountRequestLimits().resetPerEmail.max;
		for (let i = 0; i < max; i++) expect((await resetOn(i)).status).toBe(200);
		expect((await resetOn(max)).status).toBe(429);
	}, 60_000);

	it("one inviter's invitations count together", async () => {
		const owner = await signUp(app.origin, 'two-inviter');
		const workspaceId = await createWorkspace(owner, 'two');
		const inviteOn = (turn: number) => {
			const client = clientOn(turn, owner.cookie);
			return client.post(`/api/v1/workspaces/${workspaceId}/invitations`, { email: uniqueEmail('two-invitee'), role: 'viewer' });
		};
		for (let i = 0; i < INVITATIONS; i++) expect((await inviteOn(i)).status).toBe(201);
		const over = await inviteOn(INVITATIONS);
		expect(over.status).toBe(429);
		expect(over.body.error.code).toBe('too-many-invitations');
	}, 60_000);
});
