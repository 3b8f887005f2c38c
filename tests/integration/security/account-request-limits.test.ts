// Account creation and reset-link requests are capped per client: beyond the cap both the forms
// (in-process better-auth calls) and /api/auth answer 429 "too many …", while another client
// address goes on. The reset cap is checked on the served app; the sign-up cap, which the suites
// raise for themselves (they sign up hundreds of users from 127.0.0.1), on an auth instance of
// its own with the same plugin and a small cap.
import '../support/env';
import { afterAll, describe, expect, it } from 'vitest';
import { APIError } from 'better-auth/api';
import { accountRequestLimits } from '../../../src/lib/server/account-request-throttle';
import { createAuth } from '../../../src/lib/server/auth-core';
import { createDatabase } from '../../../src/lib/server/db';
import { CLIENT_IP_HEADER } from '../../../src/lib/server/sign-in-throttle';
import { servedApp } from '../support/app';
import { PASSWORD, uniqueEmail } from '../support/client';
import { freshLoopback, postFromAddress } from './support/loopback';

const app = servedApp();
const { db, pool } = createDatabase();
afterAll(() => pool.end());

describe('account-request throttle', () => {
	it('the limits are the documented ones, and SIGN_UP_LIMIT_PER_HOUR only raises the sign-up cap when it is a positive whole number', () => {
		// [common practice: a handful of reset links per person per hour, a wider cap per address]
		expect(accountRequestLimits({})).toEqual({
			signUpPerAddress: { max: 20, windowSeconds: 3600 },
			signUpPerEmail: { max: 5, windowSeconds: 3600 },
			resetPerEmail: { max: 5, windowSeconds: 3600 },
			resetPerAddress: { max: 20, windowSeconds: 3600 }
		});
		expect(accountRequestLimits({ SIGN_UP_LIMIT_PER_HOUR: '200' }).signUpPerAddress.max).toBe(200);
		for (const bad of ['0', '-3', '2.5', 'many']) expect(accountRequestLimits({ SIGN_UP_LIMIT_PER_HOUR: bad }).signUpPerAddress.max).toBe(20);
	});

	it('the reset form answers 429 after five requests for one e-mail, from any client; another e-mail is not held up', async () => {
		const email = uniqueEmail('reset-cap');
		const [first, second] = [freshLoopback(), freshLoopback()];
		const reset = (from: string) => postFromAddress(app.origin, from, '/forgot-password', 'form', { email });
		for (let i = 0; i < accountRequestLimits().resetPerEmail.max; i++) {
			// Alternating client addresses: the count is the e-mail's, so rotating addresses does not flood one mailbox.
			const ok = await reset(i % 2 ? first : second);
			expect(ok.status).toBe(200);
			expect(ok.text).toContain('is on its way');
		}
		const blocked = await reset(freshLoopback());
		expect(blocked.status).toBe(429);
		expect(blocked.text).toContain('Too many password-reset requests');
		// The same count on better-auth's own endpoint.
		const api = await postFromAddress(app.origin, first, '/api/auth/request-password-reset', 'json', { email, redirectTo: '/reset-password' });
		expect(api.status).toBe(429);
		expect(Number(api.headers['retry-after'])).toBeGreaterThan(0);
		expect((await postFromAddress(app.origin, first, '/forgot-password', 'form', { email: uniqueEmail('reset-other') })).status).toBe(200);
	});

	it('mails to one address cannot be multiplied from many clients: fresh confirmation links and sign-ups with a taken address are capped per e-mail', async () => {
		const { resetPerEmail, signUpPerEmail } = accountRequestLimits();
		const unconfirmed = uniqueEmail('confirm-cap');
		expect((await postFromAddress(app.origin, freshLoopback(), '/api/auth/sign-up/email', 'json', { email: unconfirmed, password: PASSWORD, name: 'Cap' })).status).toBe(200);
		const confirm = () => postFromAddress(app.origin, freshLoopback(), '/api/auth/send-verification-email', 'json', { email: unconfirmed });
		for (let i = 0; i < resetPerEmail.max; i++) expect((await confirm()).status).toBe(200);
		const tooMany = await confirm();
		expect(tooMany.status).toBe(429);
		expect(tooMany.text).toContain('Too many confirmation e-mails for this e-mail');
		// The sign-up above was the first of this e-mail's sign-ups; each further one (an existing account: a note to its owner) counts too.
		const signUpAgain = () => postFromAddress(app.origin, freshLoopback(), '/api/auth/sign-up/email', 'json', { email: unconfirmed, password: PASSWORD, name: 'Again' });
		for (let i = 1; i < signUpPerEmail.max; i++) expect((await signUpAgain()).status).toBe(200);
		const refused = await signUpAgain();
		expect(refused.status).toBe(429);
		expect(refused.text).toContain('Too many sign-ups for this e-mail');
	}, 30_000);

	it('sign-ups beyond the cap answer 429 over HTTP and in-process alike, per client address', async () => {
		const limits = { ...accountRequestLimits({}), signUpPerAddress: { max: 3, windowSeconds: 3600 } };
		const auth = createAuth(db, [], { accountRequests: limits });
		// Fresh addresses for each run: the counts outlive the run in the test database.
		const [one, other] = [freshLoopback(), freshLoopback()];
		const origin = app.origin;
		const signUpOver = (ip: string, label: string) =>
			auth.handler(
				new Request(`${origin}/api/auth/sign-up/email`, {
					method: 'POST',
					headers: { 'content-type': 'application/json', origin, [CLIENT_IP_HEADER]: ip },
					body: JSON.stringify({ email: uniqueEmail(label), password: PASSWORD, name: `Cap ${label}` })
				})
			);
		for (let i = 0; i < 3; i++) expect((await signUpOver(one, `cap${i}`)).status).toBe(200);
		const blocked = await signUpOver(one, 'cap-over');
		expect(blocked.status).toBe(429);
		expect(await blocked.json()).toMatchObject({ code: 'TOO_MANY_REQUESTS', message: expect.stringContaining('Too many sign-ups') });
		// The sign-up form's in-process call counts the same.
		const inProcess = await auth.api
			.signUpEmail({ body: { email: uniqueEmail('cap-form'), password: PASSWORD, name: 'Cap form' }, headers: new Headers({ [CLIENT_IP_HEADER]: one }) })
			.then(() => 'created', (e: unknown) => (e instanceof APIError ? e.statusCode : 'other error'));
		expect(inProcess).toBe(429);
		expect((await signUpOver(other, 'cap-other')).status).toBe(200);
	});
});
