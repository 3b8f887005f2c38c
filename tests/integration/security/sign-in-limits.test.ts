// Sign-in is throttled per client: after a handful of wrong passwords from one client address for
// one account, the sign-in form and /api/auth/sign-in/email both answer 429 "too many attempts"
// (the right password included) until the window ends; another client address is not blocked,
// a client cannot pick its own address with a header, a right password resets the count, and one
// address is capped over all accounts. Requests leave from chosen loopback source addresses
// (Linux routes all of 127.0.0.0/8 to the loopback device), so the app sees distinct clients.
import '../support/env';
import { describe, expect, it } from 'vitest';
import { SIGN_IN_LIMITS } from '../../../src/lib/server/sign-in-throttle';
import { servedApp } from '../support/app';
import { freshLoopback, postFromAddress } from './support/loopback';
import { PASSWORD, signUp, uniqueEmail } from '../support/client';

const app = servedApp();
const postFrom = (from: string, path: string, kind: 'form' | 'json', fields: Record<string, string>, extra: Record<string, string> = {}) =>
	postFromAddress(app.origin, from, path, kind, fields, extra);
const WRONG = 'not-the-password-0';

const form = (from: string, email: string, password: string, extra?: Record<string, string>) => postFrom(from, '/sign-in', 'form', { email, password }, extra);
const api = (from: string, email: string, password: string, extra?: Record<string, string>) => postFrom(from, '/api/auth/sign-in/email', 'json', { email, password }, extra);

const maxFailures = SIGN_IN_LIMITS.perAccount.max;

// One fresh client address per role in these tests.
const at11 = freshLoopback();
const at12 = freshLoopback();
const at13 = freshLoopback();
const at14 = freshLoopback();
const at15 = freshLoopback();
const at16 = freshLoopback();
const at17 = freshLoopback();
const at18 = freshLoopback();

describe('sign-in throttle', () => {
	// [common practice] lock further password tries for an account from one client after a handful of failures.
	it('the form answers 429 "too many attempts" after the wrong passwords, even for the right one', async () => {
		const user = await signUp(app.origin, 'throttle-form');
		for (let i = 0; i < maxFailures; i++) {
			const wrong = await form(at11, user.email, WRONG);
			expect(wrong.status).toBe(401);
			expect(wrong.text).toContain('do not match an account');
		}
		const blocked = await form(at11, user.email, PASSWORD);
		expect(blocked.status).toBe(429);
		expect(blocked.text).toContain('Too many sign-in attempts');
		expect(blocked.headers['set-cookie'] ?? []).not.toEqual(expect.arrayContaining([expect.stringMatching(/session_token=[^;]+/)]));
	});

	it('another client address is not blocked by those attempts, and a header cannot choose the address', async () => {
		const user = await signUp(app.origin, 'throttle-spoof');
		for (let i = 0; i < maxFailures; i++) expect((await form(at12, user.email, WRONG)).status).toBe(401);
		// The blocked client claims another address in every header a proxy might set: still blocked.
		const spoofed = await form(at12, user.email, PASSWORD, { 'x-loopwright-client-ip': at13, 'x-forwarded-for': at13, 'x-real-ip': at13 });
		expect(spoofed.status).toBe(429);
		// The account's owner on another machine signs in as usual.
		const owner = await form(at13, user.email, PASSWORD);
		expect(owner.status).toBe(303);
		expect(owner.headers.location).toBe('/w');
	});

	it('the same count holds on /api/auth/sign-in/email, shared with the form', async () => {
		const user = await signUp(app.origin, 'throttle-api');
		for (let i = 0; i < maxFailures; i++) {
			const wrong = i % 2 === 0 ? await api(at14, user.email, WRONG) : await form(at14, user.email, WRONG);
			expect(wrong.status).toBe(401);
		}
		const blocked = await api(at14, user.email, PASSWORD);
		expect(blocked.status).toBe(429);
		expect(JSON.parse(blocked.text)).toMatchObject({ code: 'TOO_MANY_ATTEMPTS', message: expect.stringContaining('Too many sign-in attempts') });
		expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
		expect((await form(at14, user.email, PASSWORD)).status).toBe(429);
		expect((await api(at15, user.email, PASSWORD)).status).toBe(200);
	});

	it('a right password clears the count, so people who sign in often are never blocked', async () => {
		const user = await signUp(app.origin, 'throttle-reset');
		for (let round = 0; round < 3; round++) {
			for (let i = 0; i < maxFailures - 1; i++) expect((await api(at16, user.email, WRONG)).status).toBe(401);
			expect((await form(at16, user.email, PASSWORD)).status).toBe(303);
		}
	});

	// [common practice] a wider cap per client address over all accounts, against one client trying many accounts.
	it('one client address is capped over all accounts', async () => {
		const user = await signUp(app.origin, 'throttle-address');
		for (let i = 0; i < SIGN_IN_LIMITS.perAddress.max; i++) {
			expect((await api(at17, uniqueEmail(`nobody${i}`), WRONG)).status).toBe(401);
		}
		expect((await api(at17, user.email, PASSWORD)).status).toBe(429);
		expect((await api(at18, user.email, PASSWORD)).status).toBe(200);
	}, 60_000);
});
