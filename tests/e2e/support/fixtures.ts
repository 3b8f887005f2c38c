// Playwright fixtures for the signed-in app. `signUp` creates a fresh user through
// better-auth's /api/auth endpoints and opens the confirmation link the app mailed to the local
// fake (so the session cookie lands in the page's context, as a user's browser would get it).
// `authenticatedAs(role, into?)` opens a new browser context signed in as a fresh user who
// holds `role` in a workspace: the owner of `into` invites them and they accept through
// better-auth; without `into`, a new owner and workspace are made first.
import { test as base, expect, type APIRequestContext, type Page } from '@playwright/test';
import { randomUUID } from 'node:crypto';
import { confirmationLink } from '../../integration/support/mail';

export type Role = 'owner' | 'engineer' | 'reviewer' | 'viewer';
export const PASSWORD = 'e2e-pass-12345';

export interface SignedIn {
	page: Page;
	request: APIRequestContext;
	user: { email: string; name: string };
	workspaceId: string;
}

/** POST/PATCH with the Origin header better-auth's CSRF check asks for. */
export function originHeaders(baseURL: string) {
	return { origin: baseURL };
}

export async function signUp(request: APIRequestContext, baseURL: string, name: string) {
	const email = `${name.toLowerCase().replace(/\W+/g, '-')}-${randomUUID().slice(0, 8)}@example.test`;
	const reply = await request.post('/api/auth/sign-up/email', { headers: originHeaders(baseURL), data: { email, password: PASSWORD, name } });
	expect(reply.status(), await reply.text()).toBe(200);
	const link = await confirmationLink(email);
	const confirmed = await request.get(link.pathname + link.search, { maxRedirects: 0 });
	expect(confirmed.status(), 'the confirmation link signs in and redirects').toBe(302);
	return { email, name };
}

export async function createWorkspace(request: APIRequestContext, baseURL: string, name: string): Promise<string> {
	const slug = `${name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${randomUUID().slice(0, 6)}`;
	const reply = await request.post('/api/v1/workspaces', { headers: originHeaders(baseURL), data: { name, slug } });
	expect(reply.status(), await reply.text()).toBe(201);
	return (await reply.json()).id;
}

type Fixtures = {
	authenticatedAs: (role: Role, into?: { workspaceId: string; owner: APIRequestContext }) => Promise<SignedIn>;
};

export const test = base.extend<Fixtures>({
	authenticatedAs: async ({ browser, baseURL }, use) => {
		const opened: { close(): Promise<void> }[] = [];
		const open = async () => {
			const context = await browser.newContext({ baseURL });
			opened.push(context);
			return context.newPage();
		};
		await use(async (role, into) => {
			const origin = originHeaders(baseURL!);
			let target = into;
			if (!target) {
				const ownerPage = await open();
				await signUp(ownerPage.request, baseURL!, 'Workspace Owner');
				target = { owner: ownerPage.request, workspaceId: await createWorkspace(ownerPage.request, baseURL!, 'Fixture team') };
				if (role === 'owner') {
					const me = await (await ownerPage.request.get('/api/v1/me')).json();
					return { page: ownerPage, request: ownerPage.request, user: { email: me.user.email, name: me.user.name }, workspaceId: target.workspaceId };
				}
			}
			const page = await open();
			const user = await signUp(page.request, baseURL!, `E2E ${role[0].toUpperCase()}${role.slice(1)}`);
			const invited = await target.owner.post(`/api/v1/workspaces/${target.workspaceId}/invitations`, { headers: origin, data: { email: user.email, role } });
			expect(invited.status(), await invited.text()).toBe(201);
			const accepted = await page.request.post('/api/auth/organization/accept-invitation', { headers: origin, data: { invitationId: (await invited.json()).id } });
			expect(accepted.status(), await accepted.text()).toBe(200);
			return { page, request: page.request, user, workspaceId: target.workspaceId };
		});
		for (const c of opened) await c.close();
	}
});

export { expect };
