// The routes behind the owner's administration screens, the personal settings and the signed-in
// home: API tokens bound to a workspace (its owners list and revoke them, every other role is
// refused, another workspace's owner gets 404), a script's first token from e-mail and password,
// the display name and password change, and GET /api/v1/home with its bounded lists.
import './support/env';
import { eq } from 'drizzle-orm';
import { SIGN_IN_LIMITS } from '../../src/lib/server/sign-in-throttle';
import { describe, expect, it } from 'vitest';
import { can, ROLES } from '../../src/lib/authz';
import { loopRevision } from '../../src/lib/server/db/schema';
import { HOME_LIST_LIMIT } from '../../src/lib/server/services/home';
import { withShortCorners } from '../../src/lib/verdict/cornerList';
import { Client, PASSWORD, signUp } from './support/client';
import { buckDesign } from './support/designs';
import { createWorkspace, railBody, servedTeam } from './support/fixtures';

const served = servedTeam();
const { db } = served;

const bearer = (token: string) => Object.assign(new Client(served.origin), { token });

describe('API tokens bound to a workspace', () => {
	it('act only in their workspace; its owners list and revoke them, other roles get 403, another workspace 404', async () => {
		const made = await served.team.as.engineer.post('/api/v1/tokens', { name: 'nightly regression', expiresInDays: 30, workspaceId: served.team.workspaceId });
		expect(made.status, JSON.stringify(made.body)).toBe(201);
		expect(made.body).toMatchObject({ workspaceId: served.team.workspaceId, name: 'nightly regression' });
		const script = bearer(made.body.token);

		// Acts in its workspace with the engineer's role, without naming it.
		expect((await script.get('/api/v1/projects')).status).toBe(200);
		const me = await script.get('/api/v1/me');
		expect(me.body.workspaces.map((w: { id: string }) => w.id)).toEqual([served.team.workspaceId]);
		// Another workspace the same user belongs to looks like one that does not exist.
		const second = await createWorkspace(served.team.as.engineer, 'second');
		expect((await script.get(`/api/v1/projects?workspace=${second}`)).status).toBe(404);
		expect((await script.get(`/api/v1/workspaces/${second}`)).status).toBe(404);
		expect((await served.team.as.engineer.get(`/api/v1/projects?workspace=${second}`)).status).toBe(200);

		// The owners' list names whose token it is and never the secret; every other role is refused.
		for (const role of ROLES) {
			const listed = await served.team.as[role].get(`/api/v1/workspaces/${served.team.workspaceId}/tokens`);
			if (can(role, 'token.manage')) {
				expect(listed.status).toBe(200);
				const row = listed.body.items.find((t: { id: string }) => t.id === made.body.id);
				expect(row).toMatchObject({ userEmail: served.team.as.engineer.email, name: 'nightly regression' });
				expect(JSON.stringify(listed.body)).not.toContain(made.body.token);
				expect(row).not.toHaveProperty('tokenHash');
			} else {
				expect(listed.status, role).toBe(403);
				expect((await served.team.as[role].delete(`/api/v1/workspaces/${served.team.workspaceId}/tokens/${made.body.id}`)).status, role).toBe(403);
			}
		}
		// Another workspace's owner: the workspace is not found, and so is the token under their own workspace.
		expect((await served.team.outsider.get(`/api/v1/workspaces/${served.team.workspaceId}/tokens`)).status).toBe(404);
		expect((await served.team.outsider.delete(`/api/v1/workspaces/${served.team.outsiderWorkspaceId}/tokens/${made.body.id}`)).status).toBe(404);
		expect((await script.get('/api/v1/projects')).status).toBe(200);

		// The owner revokes it: the script gets 401 at once, and a second revoke finds nothing.
		expect((await served.team.as.owner.delete(`/api/v1/workspaces/${served.team.workspaceId}/tokens/${made.body.id}`)).status).toBe(204);
		expect((await script.get('/api/v1/projects')).status).toBe(401);
		expect((await served.team.as.owner.delete(`/api/v1/workspaces/${served.team.workspaceId}/tokens/${made.body.id}`)).status).toBe(404);
		const audit = await served.team.as.owner.get(`/api/v1/audit?workspace=${served.team.workspaceId}&entityId=${made.body.id}`);
		expect(audit.body.items[0]).toMatchObject({ action: 'token.revoke' });
	});

	it('a personal token is not the owners\' to revoke; binding to a foreign workspace is a field error', async () => {
		const personal = await served.team.as.viewer.post('/api/v1/tokens', { name: 'my laptop' });
		expect(personal.body.workspaceId).toBeNull();
		expect((await served.team.as.owner.delete(`/api/v1/workspaces/${served.team.workspaceId}/tokens/${personal.body.id}`)).status).toBe(404);
		const foreign = await served.team.as.viewer.post('/api/v1/tokens', { name: 'sneaky', workspaceId: served.team.outsiderWorkspaceId });
		expect(foreign.status).toBe(404);
		expect(foreign.body.error.fields).toEqual({ workspaceId: 'not a workspace you belong to' });
	});

	it('names the field and the rule of a bad token body', async () => {
		const bad = await served.team.as.owner.post('/api/v1/tokens', { name: ' ', expiresInDays: 400 });
		expect(bad.status).toBe(400);
		expect(bad.body.error.fields).toEqual({ name: 'name the token (what uses it)', expiresInDays: 'at most 366 days' });
	});
});

describe("a script-only user's first token", () => {
	it('comes from e-mail and password, opens no session, and still cannot mint more', async () => {
		const user = await signUp(served.origin, 'scriptonly');
		const anonymous = new Client(served.origin);
		const made = await anonymous.post('/api/v1/tokens/sign-in', { email: user.email, password: PASSWORD, name: 'ci bootstrap', expiresInDays: 7 });
		expect(made.status, JSON.stringify(made.body)).toBe(201);
		expect(made.body.token).toMatch(/^lw_/);
		// No browser session came with it.
		expect(anonymous.cookie).not.toMatch(/session_token=/);
		const script = bearer(made.body.token);
		expect((await script.get('/api/v1/me')).body.user.email).toBe(user.email);
		expect((await script.post('/api/v1/tokens', { name: 'again' })).status).toBe(403);
	});

	it('refuses a wrong password at the field, and counts it like a failed sign-in', async () => {
		const user = await signUp(served.origin, 'scriptwrong');
		const wrong = await new Client(served.origin).post('/api/v1/tokens/sign-in', { email: user.email, password: 'not-the-password', name: 'x' });
		expect(wrong.status).toBe(401);
		expect(wrong.body.error).toMatchObject({ code: 'invalid-credentials', fields: { password: 'does not match' } });
		// [common practice] the sign-in limit (5 wrong per account and address in 15 min) covers this door too.
		for (let i = 0; i < 5; i++) await new Client(served.origin).post('/api/v1/tokens/sign-in', { email: user.email, password: 'still-wrong-pass', name: 'x' });
		const locked = await new Client(served.origin).post('/api/v1/tokens/sign-in', { email: user.email, password: PASSWORD, name: 'x' });
		expect(locked.status).toBe(429);
	});

	it('validates the body before any password check', async () => {
		const bad = await new Client(served.origin).post('/api/v1/tokens/sign-in', { email: 'not-an-address', name: '' });
		expect(bad.status).toBe(400);
		expect(Object.keys(bad.body.error.fields).sort()).toEqual(['email', 'name', 'password']);
	});
});

describe('personal settings', () => {
	it('changes the display name', async () => {
		const user = await signUp(served.origin, 'rename');
		expect((await user.patch('/api/v1/me', { name: 'Ada Winding' })).status).toBe(200);
		expect((await user.get('/api/v1/me')).body.user.name).toBe('Ada Winding');
		const bad = await user.patch('/api/v1/me', { name: '' });
		expect(bad.body.error.fields).toEqual({ name: 'enter your name' });
	});

	it('changes the password: wrong current one at its field, other sessions end, tokens revoked on request', async () => {
		const user = await signUp(served.origin, 'passchange');
		const other = new Client(served.origin);
		await other.post('/api/auth/sign-in/email', { email: user.email, password: PASSWORD });
		expect((await other.get('/api/v1/me')).status).toBe(200);
		const token = (await user.post('/api/v1/tokens', { name: 'old' })).body.token;

		const wrong = await user.post('/api/v1/me/password', { currentPassword: 'nope-nope-nope', newPassword: 'a-new-password-1', confirm: 'a-new-password-1' });
		expect(wrong.status).toBe(400);
		expect(wrong.body.error.fields).toEqual({ currentPassword: 'does not match' });
		const mismatch = await user.post('/api/v1/me/password', { currentPassword: PASSWORD, newPassword: 'a-new-password-1', confirm: 'different' });
		expect(mismatch.body.error.fields).toEqual({ confirm: 'the passwords differ' });

		const done = await user.post('/api/v1/me/password', { currentPassword: PASSWORD, newPassword: 'a-new-password-1', confirm: 'a-new-password-1', revokeTokens: true });
		expect(done.status, JSON.stringify(done.body)).toBe(200);
		expect(done.body.revokedTokens).toBe(1);
		expect((await user.get('/api/v1/me')).status).toBe(200);
		// The session-cache cookie may still vouch for the other session a little while; the database no longer does.
		other.cookie = other.cookie.replace(/[^;]*session_data=[^;]*(; )?/, '');
		expect((await other.get('/api/v1/me')).status).toBe(401);
		expect((await bearer(token).get('/api/v1/me')).status).toBe(401);
		// Never with a token.
		const fresh = (await user.post('/api/v1/tokens', { name: 'new' })).body.token;
		expect((await bearer(fresh).post('/api/v1/me/password', { currentPassword: 'a-new-password-1', newPassword: 'b-new-password-2', confirm: 'b-new-password-2' })).status).toBe(403);
	});

	it("closes better-auth's own /api/auth/change-password, whose wrong passwords our per-account limit would not count", async () => {
		const user = await signUp(served.origin, 'closedchange');
		for (const path of ['/api/auth/change-password', '/api/auth/change-password/']) {
			const tried = await user.post(path, { currentPassword: PASSWORD, newPassword: 'c-new-password-3', revokeOtherSessions: false });
			expect(tried.status, path).toBe(404);
			expect(tried.body.error.message).toContain('/api/v1/me/password');
		}
		// The password did not change: the old one still signs in.
		expect((await new Client(served.origin).post('/api/auth/sign-in/email', { email: user.email, password: PASSWORD })).status).toBe(200);
	});

	it('pauses password changes after SIGN_IN_LIMITS.perAccount wrong current passwords, even a right one', async () => {
		const user = await signUp(served.origin, 'guesser');
		const attempt = (currentPassword: string) => user.post('/api/v1/me/password', { currentPassword, newPassword: 'd-new-password-4', confirm: 'd-new-password-4' });
		for (let i = 0; i < SIGN_IN_LIMITS.perAccount.max; i++) expect((await attempt(`wrong-guess-${i}`)).status).toBe(400);
		const paused = await attempt(PASSWORD);
		expect(paused.status).toBe(429);
		expect(paused.body.error.code).toBe('too-many-attempts');
	});
});

describe('GET /api/v1/home', () => {
	it("lists my pending sign-offs, my rails whose stored verdict is caution or fail, and the workspace's recent activity", async () => {
		const { owner, engineer, reviewer } = served.team.as;
		const projectId = (await engineer.post(`/api/v1/projects?workspace=${served.team.workspaceId}`, { name: 'Home board' })).body.id;
		const rails: Record<string, string> = {};
		// Loads well inside CCM; the fast rail's crossover at fsw/3.3 breaks the default fc ≤ fsw/5 target.
		for (const [name, crossoverHz] of [['HOME_NOMINAL', 40_000], ['HOME_FAST', 150_000]] as const) {
			rails[name] = (await engineer.post(`/api/v1/projects/${projectId}/rails`, { ...railBody(name), ioutMin: 1.5 })).body.id;
			const saved = await engineer.post(`/api/v1/rails/${rails[name]}/loops`, { baseRevision: null, design: buckDesign({ crossoverHz }), message: `first cut of ${name}` });
			expect(saved.status).toBe(201);
		}
		const loops = await engineer.get(`/api/v1/rails/${rails.HOME_FAST}/loops`);
		const fastLoopId = loops.body.items[0].id;
		expect((await engineer.post(`/api/v1/loops/${fastLoopId}/review`, { action: 'request-review', reviewerIds: [reviewer.userId] })).status).toBe(200);

		// The stored verdicts decide the list, read from the rows themselves.
		const stored = await db.select({ railId: loopRevision.railId, v: loopRevision.verification }).from(loopRevision).where(eq(loopRevision.workspaceId, served.team.workspaceId));
		const statusOf = (railId: string) => stored.find((s) => s.railId === railId)?.v?.status;
		expect(statusOf(rails.HOME_NOMINAL)).toBe('pass');
		expect(['caution', 'fail']).toContain(statusOf(rails.HOME_FAST));

		const mine = await engineer.get(`/api/v1/home?workspace=${served.team.workspaceId}`);
		expect(mine.status).toBe(200);
		expect(mine.body.attentionRails.map((r: { railId: string }) => r.railId)).toContain(rails.HOME_FAST);
		expect(mine.body.attentionRails.map((r: { railId: string }) => r.railId)).not.toContain(rails.HOME_NOMINAL);
		expect(mine.body.attentionRails.find((r: { railId: string }) => r.railId === rails.HOME_FAST).status).toBe(statusOf(rails.HOME_FAST));
		// The summary names its corner briefly, as the verdict panel does with the same stored verdict.
		const fastVerdict = stored.find((s) => s.railId === rails.HOME_FAST)!.v!;
		expect(mine.body.attentionRails.find((r: { railId: string }) => r.railId === rails.HOME_FAST).summary).toBe(withShortCorners(fastVerdict.summary, fastVerdict.rows.map((r) => r.corner)));
		expect(mine.body.pendingReviews).toEqual([]);
		const kinds = mine.body.activity.map((a: { kind: string; railName: string }) => `${a.kind} ${a.railName}`);
		expect(kinds).toEqual(expect.arrayContaining(['revision HOME_NOMINAL', 'revision HOME_FAST', 'review-requested HOME_FAST']));
		expect(mine.body.activity.length).toBeLessThanOrEqual(HOME_LIST_LIMIT);

		// The reviewer sees the sign-off asked of them; the owner did not author these rails.
		const theirs = await reviewer.get('/api/v1/home');
		expect(theirs.body.pendingReviews.map((p: { loopId: string }) => p.loopId)).toEqual([fastLoopId]);
		expect(theirs.body.attentionRails).toEqual([]);
		expect((await owner.get('/api/v1/home')).body.attentionRails.map((r: { railId: string }) => r.railId)).not.toContain(rails.HOME_FAST);

		// A sign-off shows in the activity, and the request leaves the reviewer's list.
		expect((await reviewer.post(`/api/v1/loops/${fastLoopId}/review`, { action: 'request-changes', comment: 'fc above fsw/5' })).status).toBe(200);
		const after = await reviewer.get('/api/v1/home');
		expect(after.body.pendingReviews).toEqual([]);
		expect(after.body.activity[0]).toMatchObject({ kind: 'changes-requested', railName: 'HOME_FAST', actorName: 'Test reviewer' });
	});

	it('answers every role; 404 for a foreign workspace; a field error for a bad query; 401 signed out', async () => {
		for (const role of ROLES) expect((await served.team.as[role].get(`/api/v1/home?workspace=${served.team.workspaceId}`)).status, role).toBe(200);
		expect((await served.team.outsider.get(`/api/v1/home?workspace=${served.team.workspaceId}`)).status).toBe(404);
		const bad = await served.team.as.owner.get(`/api/v1/home?workspace=${'x'.repeat(40)}`);
		expect(bad.status).toBe(400);
		expect(bad.body.error.fields).toEqual({ workspace: 'a workspace id has at most 36 characters' });
		expect((await new Client(served.origin).get('/api/v1/home')).status).toBe(401);
	});
});
