// The account pages as a browser without JavaScript uses them (HTML forms, 303 redirects,
// session cookies), the signed-in area's redirect, and the development-only mail page.
import './support/env';
import { describe, expect, it } from 'vitest';
import { Client, PASSWORD, uniqueEmail } from './support/client';
import { servedTeam } from './support/fixtures';
import { confirmationLink, waitForMail } from './support/mail';

const served = servedTeam();

describe('account pages', () => {
	it('signs up, signs out and signs in through the forms', async () => {
		const browser = new Client(served.origin);
		const email = uniqueEmail('form');
		const tooShort = await browser.form('/sign-up', { name: 'Form User', email, password: 'short' });
		expect(tooShort.status).toBe(400);
		expect(tooShort.body).toContain('at least 10 characters');

		// No session until the address is confirmed: the page says to check the mail.
		const made = await browser.form('/sign-up?redirectTo=/w/boards', { name: 'Form User', email, password: PASSWORD });
		expect(made.status).toBe(200);
		expect(made.body).toContain('We sent a confirmation link to');
		expect((await browser.get('/api/v1/me')).status).toBe(401);
		// The mailed link confirms, signs in and continues, through the sign-in page, to where the user was going.
		const link = await confirmationLink(email);
		const confirmed = await browser.request('GET', link.pathname + link.search);
		expect(confirmed.status).toBe(302);
		expect(confirmed.location).toBe('/sign-in?verified=1&redirectTo=%2Fw%2Fboards');
		const onward = await browser.request('GET', confirmed.location!);
		expect(onward.status).toBe(303);
		expect(onward.location).toBe('/w/boards');
		expect((await browser.get('/api/v1/me')).body.user.email).toBe(email);

		const out = await browser.form('/sign-out', {});
		expect(out.status).toBe(303);
		expect((await browser.get('/api/v1/me')).status).toBe(401);

		const wrong = await browser.form('/sign-in', { email, password: 'not-the-password' });
		expect(wrong.status).toBe(401);
		expect(wrong.body).toContain('do not match an account');

		const back = await browser.form('/sign-in?redirectTo=//evil.example/x', { email, password: PASSWORD });
		expect(back.status).toBe(303);
		// An off-site redirectTo is ignored.
		expect(back.location).toBe('/w');
		expect((await browser.get('/api/v1/me')).status).toBe(200);
	});

	it('sends signed-out visitors of the signed-in area to the sign-in page', async () => {
		const reply = await fetch(`${served.origin}/w/some-workspace?x=1`, { redirect: 'manual' });
		expect(reply.status).toBe(303);
		expect(reply.headers.get('location')).toBe('/sign-in?redirectTo=%2Fw%2Fsome-workspace%3Fx%3D1');
	});

	it('mails a reset link from the forgot-password form without telling whether the address exists', async () => {
		const anonymous = new Client(served.origin);
		const unknown = await anonymous.form('/forgot-password', { email: uniqueEmail('nobody') });
		const known = await anonymous.form('/forgot-password', { email: served.team.as.viewer.email });
		expect(unknown.status).toBe(200);
		expect(known.status).toBe(200);
		const text = (html: string) => html.replace(/nobody-[^@]+@example\.test|viewer-[^@]+@example\.test/g, '<email>').replace(/<!--[\s\S]*?-->/g, '');
		expect(text(unknown.body)).toContain('a link to set a new password is on its way');
		expect(text(known.body)).toContain('a link to set a new password is on its way');
		expect((await waitForMail(served.team.as.viewer.email, /^Reset/)).subject).toBe('Reset your Loopwright password');
	});
});

describe('invitation page', () => {
	it('shows the invitation and accepts it for the invited address', async () => {
		const email = uniqueEmail('page-invitee');
		const sent = await served.team.as.owner.post(`/api/v1/workspaces/${served.team.workspaceId}/invitations`, { email, role: 'engineer' });
		const invitee = new Client(served.origin);
		const page = await invitee.request('GET', `/invitations/${sent.body.id}`);
		expect(page.status).toBe(200);
		expect(page.body).toContain('Workspace team');
		await invitee.form(`/sign-up?redirectTo=/invitations/${sent.body.id}`, { name: 'Page Invitee', email, password: PASSWORD });
		await invitee.confirm(email);
		const accepted = await invitee.form(`/invitations/${sent.body.id}?/accept`, {});
		expect(accepted.status).toBe(303);
		expect(accepted.location).toBe(`/w/${served.team.workspaceId}`);
		expect((await invitee.get('/api/v1/me')).body.workspaces).toEqual([expect.objectContaining({ id: served.team.workspaceId, role: 'engineer' })]);
		expect((await invitee.request('GET', '/invitations/00000000-0000-0000-0000-000000000000')).status).toBe(404);
	});
});

describe('captured mail page (development)', () => {
	it("shows each signed-in user only the messages to their own address, never another's reset or invitation link", async () => {
		const invited = uniqueEmail('listed');
		await served.team.as.owner.post(`/api/v1/workspaces/${served.team.workspaceId}/invitations`, { email: invited, role: 'viewer' });
		await new Client(served.origin).post('/api/auth/request-password-reset', { email: served.team.as.reviewer.email, redirectTo: '/reset-password' });
		await waitForMail(invited, /invited you/);
		await waitForMail(served.team.as.reviewer.email, /^Reset/);
		const owner = await served.team.as.owner.request('GET', '/dev/mail');
		expect(owner.status).toBe(200);
		// The owner's own confirmation mail is there; the invitation they sent and the reviewer's reset link are not.
		expect(owner.body).toContain('Confirm your e-mail address');
		expect(owner.body).not.toContain(invited);
		expect(owner.body).not.toContain('Reset your Loopwright password');
		const reviewer = await served.team.as.reviewer.request('GET', '/dev/mail');
		expect(reviewer.status).toBe(200);
		expect(reviewer.body).toContain('Reset your Loopwright password');
		expect(reviewer.body).not.toContain(invited);
		expect((await new Client(served.origin).request('GET', '/dev/mail')).status).toBe(303);
	});
});
