// Accounts end to end through better-auth's own endpoints and ours: invitations by e-mail
// (captured by the fake SMTP server) with our roles only, password reset by e-mail, and
// personal API tokens that act with their owner's role until revoked.
import './support/env';
import { describe, expect, it } from 'vitest';
import { Client, PASSWORD, signUp, uniqueEmail } from './support/client';
import { servedTeam } from './support/fixtures';
import { firstLink, waitForMail } from './support/mail';

const served = servedTeam();

describe('invitations', () => {
	it('mails an invitation link; the invitee signs up, accepts and holds the invited role', async () => {
		const email = uniqueEmail('invitee');
		const sent = await served.team.as.owner.post(`/api/v1/workspaces/${served.team.workspaceId}/invitations`, { email, role: 'reviewer' });
		expect(sent.status).toBe(201);

		const mail = await waitForMail(email, /invited you/);
		expect(mail.subject).toContain('Workspace team');
		const link = firstLink(mail.text);
		expect(link).toBe(`${served.origin}/invitations/${sent.body.id}`);

		const invitee = new Client(served.origin);
		expect((await invitee.post('/api/auth/sign-up/email', { email, password: PASSWORD, name: 'Invited Reviewer' })).status).toBe(200);
		await invitee.confirm(email);
		const accepted = await invitee.post('/api/auth/organization/accept-invitation', { invitationId: sent.body.id });
		expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);

		const me = await invitee.get('/api/v1/me');
		expect(me.body.workspaces).toEqual([expect.objectContaining({ id: served.team.workspaceId, role: 'reviewer' })]);
		const trail = await served.team.as.owner.get(`/api/v1/audit?workspace=${served.team.workspaceId}&entityId=${sent.body.id}`);
		expect(trail.body.items[0]).toMatchObject({ action: 'member.invite', after: { email, role: 'reviewer' } });
	});

	it("refuses better-auth's built-in role names and unknown roles, on our API and on the plugin's", async () => {
		for (const role of ['admin', 'member', 'owner,viewer', 'superuser']) {
			const ours = await served.team.as.owner.post(`/api/v1/workspaces/${served.team.workspaceId}/invitations`, { email: uniqueEmail('x'), role });
			expect(ours.status, role).toBe(400);
			expect(ours.body.error.fields.role).toMatch(/owner, engineer, reviewer, viewer/);
			const theirs = await served.team.as.owner.post('/api/auth/organization/invite-member', { email: uniqueEmail('y'), role, organizationId: served.team.workspaceId });
			expect(theirs.status, `plugin ${role}`).toBeGreaterThanOrEqual(400);
			expect(theirs.status, `plugin ${role}`).toBeLessThan(500);
		}
		const roleChange = await served.team.as.owner.post('/api/auth/organization/update-member-role', {
			memberId: (await served.team.as.owner.get(`/api/v1/workspaces/${served.team.workspaceId}/members`)).body.items.find((m: { role: string }) => m.role === 'viewer').id,
			role: 'admin',
			organizationId: served.team.workspaceId
		});
		expect(roleChange.status).toBeGreaterThanOrEqual(400);
	});

	it('lets only owners invite through the plugin endpoint too', async () => {
		const reply = await served.team.as.engineer.post('/api/auth/organization/invite-member', { email: uniqueEmail('z'), role: 'viewer', organizationId: served.team.workspaceId });
		expect(reply.status).toBe(403);
	});

	it('keeps a last owner', async () => {
		const members = (await served.team.as.owner.get(`/api/v1/workspaces/${served.team.workspaceId}/members`)).body.items;
		const self = members.find((m: { userId: string }) => m.userId === served.team.as.owner.userId);
		const demote = await served.team.as.owner.patch(`/api/v1/workspaces/${served.team.workspaceId}/members/${self.id}`, { role: 'viewer' });
		expect(demote.status).toBe(422);
		expect(demote.body.error.code).toBe('last-owner');
		expect(demote.body.error.fields).toEqual({ role: 'the last owner stays owner: make someone else owner first' });
	});
});

describe('password reset', () => {
	it('mails a one-time link that sets a new password', async () => {
		const user = await signUp(served.origin, 'forgetful');
		const anonymous = new Client(served.origin);
		expect((await anonymous.post('/api/auth/request-password-reset', { email: user.email, redirectTo: '/reset-password' })).status).toBe(200);
		const link = firstLink((await waitForMail(user.email, /^Reset your/)).text);
		const follow = await fetch(link, { redirect: 'manual' });
		expect(follow.status).toBe(302);
		const token = new URL(follow.headers.get('location')!, served.origin).searchParams.get('token');
		expect(token).toBeTruthy();
		expect((await anonymous.post('/api/auth/reset-password', { newPassword: 'brand-new-pass-456', token })).status).toBe(200);

		const oldPassword = await anonymous.post('/api/auth/sign-in/email', { email: user.email, password: PASSWORD });
		expect(oldPassword.status).toBe(401);
		const newPassword = await anonymous.post('/api/auth/sign-in/email', { email: user.email, password: 'brand-new-pass-456' });
		expect(newPassword.status).toBe(200);
	});
});

describe('API tokens', () => {
	it("act with their owner's role and stop working when revoked", async () => {
		const made = await served.team.as.viewer.post('/api/v1/tokens', { name: 'ci job' });
		expect(made.status).toBe(201);
		expect(made.body.token).toMatch(/^lw_/);

		const script = new Client(served.origin);
		script.token = made.body.token;
		expect((await script.get(`/api/v1/projects?workspace=${served.team.workspaceId}`)).status).toBe(200);
		expect((await script.post(`/api/v1/projects?workspace=${served.team.workspaceId}`, { name: 'from ci' })).status).toBe(403);
		// A token cannot mint more tokens.
		expect((await script.post('/api/v1/tokens', { name: 'again' })).status).toBe(403);

		const listed = await served.team.as.viewer.get('/api/v1/tokens');
		expect(listed.body.items[0]).not.toHaveProperty('token');
		expect(listed.body.items[0]).not.toHaveProperty('tokenHash');

		expect((await served.team.as.engineer.delete(`/api/v1/tokens/${made.body.id}`)).status).toBe(404);
		expect((await served.team.as.viewer.delete(`/api/v1/tokens/${made.body.id}`)).status).toBe(204);
		expect((await script.get(`/api/v1/projects?workspace=${served.team.workspaceId}`)).status).toBe(401);
	});
});
