// An owner runs the team from the app alone, in Chromium: the signed-in home goes straight into
// the only workspace; on the administration page the owner invites an address and sees it
// pending, resends and cancels it, changes a member's role, is refused demoting the last owner
// at the role field, removes a member, creates an API token shown once, uses it like a script
// would (a bare HTTP request with Authorization: Bearer) and revokes it (401 afterwards). The
// personal settings page renames the user. Screenshots of both pages in both themes at 1280×800
// go to test-results/ for review.
import type { Page } from '@playwright/test';
import { randomUUID } from 'node:crypto';
import { request as playwrightRequest } from '@playwright/test';
import { expect, test } from './support/fixtures';

async function shoot(page: Page, name: string) {
	for (const theme of ['light', 'dark'] as const) {
		await page.evaluate((t) => (document.documentElement.dataset.theme = t), theme);
		await page.screenshot({ path: `test-results/admin-${name}-${theme}.png`, fullPage: false });
	}
	await page.evaluate(() => (document.documentElement.dataset.theme = 'light'));
}

test('an owner runs the team from the app alone', async ({ authenticatedAs, baseURL }) => {
	test.setTimeout(150_000);
	const owner = await authenticatedAs('owner');
	const engineer = await authenticatedAs('engineer', { workspaceId: owner.workspaceId, owner: owner.request });
	const reviewer = await authenticatedAs('reviewer', { workspaceId: owner.workspaceId, owner: owner.request });
	const page = owner.page;
	await page.setViewportSize({ width: 1280, height: 800 });

	// One workspace: the home goes straight in, and shows what waits for the owner.
	await page.goto('/w');
	await expect(page).toHaveURL(new RegExp(`/w/${owner.workspaceId}$`));
	await expect(page.getByTestId('home-reviews')).toContainText('Nothing waits for your sign-off');
	await page.getByTestId('nav-admin').click();
	await expect(page).toHaveURL(new RegExp(`/w/${owner.workspaceId}/admin$`));
	await expect(page.getByRole('heading', { name: /Administration/ })).toBeVisible();

	// Invite, see it pending, resend, cancel.
	const invitee = `invitee-${randomUUID().slice(0, 8)}@example.test`;
	await page.getByLabel('Invite by e-mail').fill(invitee);
	await page.getByLabel('Role', { exact: true }).selectOption('viewer');
	await page.getByTestId('admin-invite-send').click();
	await expect(page.getByTestId('invite-note')).toHaveText(`Invitation sent to ${invitee}.`);
	const pendingRow = page.locator(`[data-testid="invitation-row"][data-email="${invitee}"]`);
	await expect(pendingRow).toContainText('as viewer');
	await pendingRow.getByTestId('invitation-resend').click();
	await expect(page.getByTestId('invite-note')).toHaveText(`Invitation sent to ${invitee}.`);
	await expect(pendingRow).toHaveCount(1);
	await shoot(page, 'page');
	await pendingRow.getByTestId('invitation-cancel').click();
	await expect(page.getByTestId('invite-note')).toHaveText(`The invitation to ${invitee} is cancelled.`);
	await expect(pendingRow).toHaveCount(0);

	// Change a role.
	const engineerRow = page.locator(`[data-testid="member-row"][data-email="${engineer.user.email}"]`);
	await engineerRow.getByTestId('member-role').selectOption('reviewer');
	await engineerRow.getByTestId('member-save').click();
	await expect(page.getByTestId('member-note')).toHaveText(`${engineer.user.name} is now reviewer.`);
	const members = await (await owner.request.get(`/api/v1/workspaces/${owner.workspaceId}/members`)).json();
	expect(members.items.find((m: { email: string }) => m.email === engineer.user.email).role).toBe('reviewer');

	// The last owner cannot step down: the server's refusal shows at that row's role.
	const ownerRow = page.locator(`[data-testid="member-row"][data-email="${owner.user.email}"]`);
	await ownerRow.getByTestId('member-role').selectOption('viewer');
	await ownerRow.getByTestId('member-save').click();
	await expect(ownerRow.getByTestId('member-error')).toHaveText('the last owner stays owner: make someone else owner first');
	await expect(ownerRow.getByTestId('member-role')).toHaveAttribute('aria-invalid', 'true');

	// Remove a member (after the confirmation dialog).
	const reviewerRow = page.locator(`[data-testid="member-row"][data-email="${reviewer.user.email}"]`);
	page.once('dialog', (d) => d.accept());
	await reviewerRow.getByTestId('member-remove').click();
	await expect(page.getByTestId('member-note')).toHaveText(`${reviewer.user.name} was removed.`);
	await expect(reviewerRow).toHaveCount(0);
	expect((await reviewer.request.get(`/api/v1/workspaces/${owner.workspaceId}`)).status()).toBe(404);

	// An API token: shown once, works for a script, revoked → 401.
	await page.getByLabel('Token name (what uses it)').fill('nightly regression');
	await page.getByLabel('Expires after (days)').fill('30');
	await page.getByTestId('token-create').click();
	const secret = (await page.getByTestId('token-secret').textContent())!.trim();
	expect(secret).toMatch(/^lw_[A-Za-z0-9_-]{43}$/);
	const tokenRow = page.locator('[data-testid="token-row"][data-token-name="nightly regression"]');
	await expect(tokenRow).toContainText(secret.slice(0, 10));
	await expect(tokenRow).not.toContainText(secret);
	await shoot(page, 'token-shown');

	const script = await playwrightRequest.newContext({ baseURL });
	const asScript = () => script.get('/api/v1/projects', { headers: { authorization: `Bearer ${secret}` } });
	expect((await asScript()).status()).toBe(200);

	// Shown once: after a reload the secret is nowhere on the page.
	await page.reload();
	await expect(page.getByTestId('token-secret')).toHaveCount(0);
	expect(await page.content()).not.toContain(secret);
	await tokenRow.getByTestId('token-revoke').click();
	await expect(tokenRow).toHaveAttribute('data-state', 'revoked');
	expect((await asScript()).status()).toBe(401);
	await script.dispose();
});

test('personal settings: rename yourself and keep your own tokens', async ({ authenticatedAs }) => {
	const me = await authenticatedAs('owner');
	const page = me.page;
	await page.setViewportSize({ width: 1280, height: 800 });
	await page.goto(`/w/${me.workspaceId}`);
	await page.getByTestId('nav-user').click();
	await expect(page).toHaveURL(/\/settings$/);
	await expect(page.getByTestId('settings-email')).toHaveText(me.user.email);
	await page.getByLabel(/Display name/).fill('');
	await page.getByTestId('name-save').click();
	await expect(page.getByTestId('error-settings-display-name')).toHaveText('enter your name');
	await page.getByLabel(/Display name/).fill('Ada Winding');
	await page.getByTestId('name-save').click();
	await expect(page.getByTestId('name-note')).toHaveText('Your name is saved.');
	await expect(page.getByTestId('nav-user')).toHaveText('Ada Winding');

	await page.getByLabel('Token name (what uses it)').fill('laptop');
	await page.getByTestId('token-create').click();
	await expect(page.getByTestId('token-secret')).toHaveText(/^lw_/);
	await expect(page.locator('[data-testid="token-row"][data-token-name="laptop"]')).toContainText('all your workspaces');
	await page.getByLabel('Current password').fill('wrong-password-1');
	await page.getByLabel('New password', { exact: true }).fill('a-new-password-1');
	await page.getByLabel('New password again').fill('a-new-password-1');
	await page.getByTestId('password-save').click();
	await expect(page.getByTestId('error-current-password')).toHaveText('does not match');
	await shoot(page, 'settings');
});
