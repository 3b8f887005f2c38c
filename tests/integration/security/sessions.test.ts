// Sessions end when they should: an expired session or API token is refused, signing out
// ends the session on the server (a copied cookie stops working), and the session cookie
// is out of reach of page scripts and of cross-site requests. The server trusts its signed
// session cookie cache for SESSION_CACHE_SECONDS (2 s in these tests, 60 s by default) before it
// asks the database again, so a session ended elsewhere is refused at the latest after that time.
import '../support/env';
import { eq } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { session } from '../../../src/lib/server/db/auth-schema';
import { apiToken } from '../../../src/lib/server/db/schema';
import { servedApp } from '../support/app';
import { Client, PASSWORD, signUp } from '../support/client';
import { testDb } from '../support/fixtures';

const app = servedApp();
const { db, pool } = testDb();

afterAll(async () => {
	await pool.end();
});

/** How long a copied session cookie may outlive its session: the cookie cache's age, plus a margin. */
const CACHE_MS = Number(process.env.SESSION_CACHE_SECONDS) * 1000;
const outlivedCache = () => new Promise((resolve) => setTimeout(resolve, CACHE_MS + 700));

/** A second client holding a copy of the first one's cookie: what a stolen cookie would do. */
function copyOf(client: Client): Client {
	const copy = new Client(app.origin);
	copy.cookie = client.cookie;
	return copy;
}

describe('sessions', () => {
	it('an expired session is refused on the API and on signed-in pages', async () => {
		const user = await signUp(app.origin, 'expiry');
		expect((await user.get('/api/v1/me')).status).toBe(200);
		await db.update(session).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(session.userId, user.userId));
		await outlivedCache();
		expect((await user.get('/api/v1/me')).status).toBe(401);
		const page = await fetch(app.origin + '/w', { headers: { cookie: user.cookie }, redirect: 'manual' });
		expect(page.status).toBe(303);
		expect(page.headers.get('location')).toMatch(/^\/sign-in/);
	});

	it('signing out through the API ends the session on the server, not only in the browser', async () => {
		const user = await signUp(app.origin, 'signout');
		const stolen = copyOf(user);
		const out = await user.post('/api/auth/sign-out', {});
		expect(out.status).toBe(200);
		// The row goes at once; the copy is refused once its cached session has run out.
		expect(await db.select().from(session).where(eq(session.userId, user.userId))).toEqual([]);
		expect((await user.get('/api/v1/me')).status).toBe(401);
		await outlivedCache();
		expect((await stolen.get('/api/v1/me')).status).toBe(401);
	});

	it('signing out through the form ends the session on the server too', async () => {
		const user = await signUp(app.origin, 'formout');
		const stolen = copyOf(user);
		const out = await user.form('/sign-out', {});
		expect(out.status).toBe(303);
		expect(await db.select().from(session).where(eq(session.userId, user.userId))).toEqual([]);
		await outlivedCache();
		expect((await stolen.get('/api/v1/me')).status).toBe(401);
	});

	it('signing in again gives a new session id, and the cookie is HttpOnly and SameSite=Lax', async () => {
		const user = await signUp(app.origin, 'cookie');
		const before = user.cookie;
		const response = await fetch(app.origin + '/api/auth/sign-in/email', {
			method: 'POST',
			headers: { origin: app.origin, 'content-type': 'application/json' },
			body: JSON.stringify({ email: user.email, password: PASSWORD })
		});
		expect(response.status).toBe(200);
		const sessionCookie = response.headers.getSetCookie().find((c) => /session_token=/.test(c));
		expect(sessionCookie).toBeDefined();
		expect(sessionCookie).toMatch(/;\s*HttpOnly/i);
		expect(sessionCookie).toMatch(/;\s*SameSite=Lax/i);
		expect(sessionCookie).toMatch(/;\s*Path=\//i);
		expect(sessionCookie!.split(';')[0]).not.toBe(before.split('; ').find((c) => c.includes('session_token')));
	});
});

describe('session cookie cache', () => {
	it('is on, signed, and bounded by SESSION_CACHE_SECONDS', async () => {
		const user = await signUp(app.origin, 'cache');
		const data = user.cookie.split('; ').find((c) => /session_data=/.test(c));
		expect(data, 'better-auth sets its session_data cookie when the cache is on').toBeDefined();
		await db.delete(session).where(eq(session.userId, user.userId));
		// The trade-off, within the cache's age: the signed copy is still believed without the row...
		expect((await user.get('/api/v1/me')).status).toBe(200);
		// ...but a tampered copy is not: the server falls back to the (deleted) database row.
		const forged = new Client(app.origin);
		forged.cookie = user.cookie.replace(/session_data=([^;]*)/, (_m, v: string) => `session_data=${v.slice(0, -4)}AAAA`);
		expect((await forged.get('/api/v1/me')).status).toBe(401);
		await outlivedCache();
		expect((await user.get('/api/v1/me')).status).toBe(401);
	});
});

describe('API tokens', () => {
	it('an expired token is refused', async () => {
		const user = await signUp(app.origin, 'tokenexpiry');
		const made = await user.post('/api/v1/tokens', { name: 'short-lived', expiresInDays: 1 });
		expect(made.status).toBe(201);
		const script = new Client(app.origin);
		script.token = made.body.token;
		expect((await script.get('/api/v1/me')).status).toBe(200);
		await db.update(apiToken).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(apiToken.id, made.body.id));
		expect((await script.get('/api/v1/me')).status).toBe(401);
	});

	it('a token never opens the pages or the auth endpoints (it is for /api/v1 only)', async () => {
		const user = await signUp(app.origin, 'tokenpages');
		const made = await user.post('/api/v1/tokens', { name: 'api only' });
		const page = await fetch(app.origin + '/w', { headers: { authorization: `Bearer ${made.body.token}` }, redirect: 'manual' });
		expect(page.status).toBe(303);
		const who = await fetch(app.origin + '/api/auth/get-session', { headers: { authorization: `Bearer ${made.body.token}` } });
		expect(await who.json()).toBeNull();
	});
});
