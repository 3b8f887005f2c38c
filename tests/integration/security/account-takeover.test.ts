// The account-takeover paths (README.md, "Deployment notes"), tried as an attacker would on the served app:
// reading another user's reset or invitation link on the captured-mail page, listing pending
// invitations as a non-owner, signing up with an invited address and accepting it without
// owning the mailbox, being sent off-site by a crafted redirectTo, flooding invitation e-mail,
// and keeping API tokens past a password reset. Each failed on the code before this file.
import '../support/env';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { member, user as userTable } from '../../../src/lib/server/db/schema';
import { invitationLimits } from '../../../src/lib/server/invitation-limits';
import { servedApp } from '../support/app';
import { Client, PASSWORD, signUp, uniqueEmail } from '../support/client';
import { buildTeam, createWorkspace, testDb, type Team } from '../support/fixtures';
import { confirmationLink, firstLink, waitForMail } from '../support/mail';

const app = servedApp();
const { db, pool } = testDb();
let team: Team;

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
});
afterAll(() => pool.end());

const invite = (who: Client, workspaceId: string, email: string, role = 'viewer') => who.post(`/api/v1/workspaces/${workspaceId}/invitations`, { email, role });

/** How long a copied session cookie may outlive a change in the database (SESSION_CACHE_SECONDS, 2 s in tests). */
const outlivedCache = () => new Promise((r) => setTimeout(r, Number(process.env.SESSION_CACHE_SECONDS) * 1000 + 700));

describe('captured mail', () => {
	it("a self-registered workspace owner cannot read another user's reset link on /dev/mail", async () => {
		const attacker = await signUp(app.origin, 'mail-thief');
		await createWorkspace(attacker, 'thief');
		const victim = team.as.reviewer;
		expect((await new Client(app.origin).post('/api/auth/request-password-reset', { email: victim.email, redirectTo: '/reset-password' })).status).toBe(200);
		const resetMail = await waitForMail(victim.email, /^Reset/);
		const resetLink = firstLink(resetMail.text);

		const page = await attacker.request<string>('GET', '/dev/mail');
		expect(page.status).toBe(200);
		expect(page.body).not.toContain(resetLink);
		expect(page.body).not.toContain(victim.email);
		// The victim sees their own link.
		expect((await victim.request<string>('GET', '/dev/mail')).body).toContain(resetLink);
	});

	it('an invitation link is shown to its addressee only, not to the owner who sent it', async () => {
		const invitee = await signUp(app.origin, 'mail-invitee');
		const sent = await invite(team.as.owner, team.workspaceId, invitee.email);
		expect(sent.status).toBe(201);
		await waitForMail(invitee.email, /invited you/);
		expect((await team.as.owner.request<string>('GET', '/dev/mail')).body).not.toContain(`/invitations/${sent.body.id}`);
		expect((await invitee.request<string>('GET', '/dev/mail')).body).toContain(`/invitations/${sent.body.id}`);
	});
});

describe('invitations', () => {
	it('only owners list pending invitations', async () => {
		await invite(team.as.owner, team.workspaceId, uniqueEmail('listed'));
		for (const role of ['engineer', 'reviewer', 'viewer'] as const) {
			const reply = await team.as[role].get(`/api/v1/workspaces/${team.workspaceId}/invitations`);
			expect(reply.status, role).toBe(403);
		}
		expect((await team.as.viewer.get(`/api/auth/organization/list-invitations?organizationId=${team.workspaceId}`)).status).toBe(403);
		const owner = await team.as.owner.get(`/api/v1/workspaces/${team.workspaceId}/invitations`);
		expect(owner.status).toBe(200);
		expect(owner.body.items.length).toBeGreaterThan(0);
	});

	it("the audit trail shows invitation entries (address, the link's id) to owners only", async () => {
		const sent = await invite(team.as.owner, team.workspaceId, uniqueEmail('audited'));
		const trail = (who: Client) => who.get(`/api/v1/audit?workspace=${team.workspaceId}&limit=200`);
		const ids = (reply: { body: { items: { entityId: string }[] } }) => reply.body.items.map((i) => i.entityId);
		expect(ids(await trail(team.as.owner))).toContain(sent.body.id);
		for (const role of ['engineer', 'reviewer', 'viewer'] as const) {
			const reply = await trail(team.as[role]);
			expect(reply.status, role).toBe(200);
			expect(ids(reply), role).not.toContain(sent.body.id);
			expect(JSON.stringify(reply.body), role).not.toContain('"member.invite"');
		}
		expect((await team.as.viewer.get(`/api/v1/audit?workspace=${team.workspaceId}&entityId=${sent.body.id}`)).body.items).toEqual([]);
	});

	it('signing up with an invited address gives no session, so the invitation cannot be accepted without the mailbox', async () => {
		const invited = uniqueEmail('hijacked');
		const sent = await invite(team.as.owner, team.workspaceId, invited, 'owner');
		const squatter = new Client(app.origin);
		const made = await squatter.post('/api/auth/sign-up/email', { email: invited, password: PASSWORD, name: 'Squatter' });
		expect(made.status).toBe(200);
		expect(made.body.token).toBeNull();
		expect((await squatter.get('/api/v1/me')).status).toBe(401);
		expect((await squatter.post('/api/auth/sign-in/email', { email: invited, password: PASSWORD })).status).toBe(403);
		const accepted = await squatter.post('/api/auth/organization/accept-invitation', { invitationId: sent.body.id });
		expect(accepted.status).toBe(401);
		const roles = await db.select({ role: member.role }).from(member).where(eq(member.organizationId, team.workspaceId));
		expect(roles.filter((r) => r.role === 'owner')).toHaveLength(1);
	});

	it('a session whose address is not confirmed cannot accept, through the plugin endpoint or the invitation page', async () => {
		const holder = await signUp(app.origin, 'unconfirmed');
		const sent = await invite(team.as.owner, team.workspaceId, holder.email, 'engineer');
		// A session from before confirmation was required: the user row says unconfirmed.
		await db.update(userTable).set({ emailVerified: false }).where(eq(userTable.id, holder.userId));
		await outlivedCache();
		const viaPlugin = await holder.post('/api/auth/organization/accept-invitation', { invitationId: sent.body.id });
		expect(viaPlugin.status).toBe(403);
		const page = await holder.request<string>('GET', `/invitations/${sent.body.id}`);
		expect(page.body).toContain('Confirm your e-mail address first');
		const viaPage = await holder.form(`/invitations/${sent.body.id}?/accept`, {});
		expect(viaPage.status).toBe(403);
		expect((await holder.get('/api/v1/me')).body.workspaces).toEqual([]);
		// Confirmed again (the mailed link), the same invitation is accepted.
		await db.update(userTable).set({ emailVerified: true }).where(eq(userTable.id, holder.userId));
		await outlivedCache();
		expect((await holder.post('/api/auth/organization/accept-invitation', { invitationId: sent.body.id })).status).toBe(200);
	});

	it("a confirmed user cannot accept an invitation to someone else's address", async () => {
		const sent = await invite(team.as.owner, team.workspaceId, uniqueEmail('someone-else'));
		const other = await signUp(app.origin, 'other-address');
		expect((await other.post('/api/auth/organization/accept-invitation', { invitationId: sent.body.id })).status).toBe(403);
	});

	it('invitation e-mails are capped per inviter and per workspace, on our API and on the plugin endpoint', async () => {
		const limits = invitationLimits();
		const owner = await signUp(app.origin, 'inviter');
		const workspaceId = await createWorkspace(owner, 'invites');
		for (let i = 0; i < limits.perInviter.max; i++) expect((await invite(owner, workspaceId, uniqueEmail(`inv${i}`))).status).toBe(201);
		const over = await invite(owner, workspaceId, uniqueEmail('inv-over'));
		expect(over.status).toBe(429);
		expect(over.body.error).toMatchObject({ code: 'too-many-invitations', message: expect.stringContaining(`you sent ${limits.perInviter.max} invitations this hour`) });
		const plugin = await owner.post('/api/auth/organization/invite-member', { email: uniqueEmail('inv-plugin'), role: 'viewer', organizationId: workspaceId });
		expect(plugin.status).toBe(429);
		// Other owners of the same workspace share the workspace's cap.
		const coOwners = await Promise.all([signUp(app.origin, 'co-owner-a'), signUp(app.origin, 'co-owner-b')]);
		await db.insert(member).values(coOwners.map((c) => ({ id: randomUUID(), organizationId: workspaceId, userId: c.userId, role: 'owner', createdAt: new Date() })));
		let sent = limits.perInviter.max;
		for (const coOwner of coOwners) {
			while (sent < limits.perWorkspace.max && (await invite(coOwner, workspaceId, uniqueEmail(`ws${sent}`))).status === 201) sent++;
		}
		expect(sent).toBe(limits.perWorkspace.max);
		const workspaceOver = await invite(coOwners[1], workspaceId, uniqueEmail('ws-over'));
		expect(workspaceOver.status).toBe(429);
		expect(workspaceOver.body.error.message).toContain(`this workspace sent ${limits.perWorkspace.max} invitations this hour`);
	}, 60_000);
});

describe('redirects', () => {
	// [published: WHATWG URL Standard] a tab inside a URL is removed, so `/<TAB>/evil.example` is `//evil.example`.
	const attacks = ['%2F%09%2Fevil.example%2Fphish', '%2F%2Fevil.example', '%2F%5Cevil.example', 'https%3A%2F%2Fevil.example', '%2F%0A%2Fevil.example'];

	it('a signed-in visit of /sign-in?redirectTo=<off-site> lands on the home page', async () => {
		for (const attack of attacks) {
			const reply = await fetch(`${app.origin}/sign-in?redirectTo=${attack}`, { redirect: 'manual', headers: { cookie: team.as.viewer.cookie } });
			expect(reply.status, attack).toBe(303);
			expect(reply.headers.get('location'), attack).toBe('/w');
		}
		const own = await fetch(`${app.origin}/sign-in?redirectTo=%2Fw%2Fx%3Fa%3D1`, { redirect: 'manual', headers: { cookie: team.as.viewer.cookie } });
		expect(own.headers.get('location')).toBe('/w/x?a=1');
	});

	it('the sign-in and sign-up forms and the confirmation link never carry an off-site destination', async () => {
		const user = await signUp(app.origin, 'redirect-form');
		for (const attack of attacks) {
			const signedIn = await new Client(app.origin).form(`/sign-in?redirectTo=${attack}`, { email: user.email, password: PASSWORD });
			expect(signedIn.location, attack).toBe('/w');
		}
		const email = uniqueEmail('redirect-sign-up');
		expect((await new Client(app.origin).form(`/sign-up?redirectTo=${attacks[0]}`, { name: 'Redirect', email, password: PASSWORD })).status).toBe(200);
		const link = await confirmationLink(email);
		expect(link.searchParams.get('callbackURL')).toBe('/sign-in?verified=1&redirectTo=%2Fw');
		const confirmed = await new Client(app.origin).request('GET', link.pathname + link.search);
		expect(confirmed.location).toBe('/sign-in?verified=1&redirectTo=%2Fw');
	});
});

describe('password reset', () => {
	it('revokes the API tokens of the account, and the mail and page say so', async () => {
		const owner = await signUp(app.origin, 'token-holder');
		const made = await owner.post('/api/v1/tokens', { name: 'ci' });
		const script = new Client(app.origin);
		script.token = made.body.token;
		expect((await script.get('/api/v1/me')).status).toBe(200);

		const anonymous = new Client(app.origin);
		await anonymous.post('/api/auth/request-password-reset', { email: owner.email, redirectTo: '/reset-password' });
		const mail = await waitForMail(owner.email, /^Reset/);
		expect(mail.text).toContain('revokes your API tokens');
		const follow = await fetch(firstLink(mail.text), { redirect: 'manual' });
		const token = new URL(follow.headers.get('location')!, app.origin).searchParams.get('token')!;
		const reset = await anonymous.form('/reset-password', { token, password: 'a-new-password-789', confirm: 'a-new-password-789' });
		expect(reset.location).toBe('/sign-in?reset=1');
		expect(await (await fetch(`${app.origin}/sign-in?reset=1`)).text()).toContain('your API tokens were revoked');

		expect((await script.get('/api/v1/me')).status).toBe(401);
		const signedIn = new Client(app.origin);
		expect((await signedIn.post('/api/auth/sign-in/email', { email: owner.email, password: 'a-new-password-789' })).status).toBe(200);
		const listed = await signedIn.get('/api/v1/tokens');
		expect(listed.body.items[0].revokedAt).not.toBeNull();
	});
});
