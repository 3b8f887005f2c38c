// Security checks that need the production build (SvelteKit's form-origin check and
// better-auth's origin check are off in the dev server the integration tests use):
// cross-site form posts to every page action and every /api/v1 write are refused, even with a
// valid session; better-auth refuses a foreign Origin; names typed by users render as text.
import { expect, test } from '@playwright/test';
import { randomUUID } from 'node:crypto';
import { apiHandlers, pageServerExports } from '../integration/security/routes';
import { chunkedUpload } from '../integration/security/support/chunked';
import { createWorkspace, originHeaders, PASSWORD, signUp } from './support/fixtures';
import { confirmationLink } from '../integration/support/mail';

const EVIL = 'https://evil.example';
const FORM_TYPES: [string, (fields: Record<string, string>) => string][] = [
	['application/x-www-form-urlencoded', (f) => new URLSearchParams(f).toString()],
	['text/plain', (f) => Object.entries(f).map(([k, v]) => `${k}=${v}`).join('\n')],
	['multipart/form-data; boundary=x', (f) => Object.entries(f).map(([k, v]) => `--x\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`).join('') + '--x--\r\n']
];

test('cross-site form posts are refused on every page action and every /api/v1 write, with a valid session', async ({ request, baseURL }) => {
	const user = await signUp(request, baseURL!, 'Cross Site');
	const targets = [
		...pageServerExports()
			.filter((e) => e.kind === 'action')
			.map((a) => ({ method: 'POST', path: a.route.replace(/\[[^\]]+\]/g, 'x') + (a.name === 'default' ? '' : `?/${a.name}`) })),
		...apiHandlers()
			.filter((h) => h.method !== 'GET')
			.map((h) => ({ method: h.method, path: h.route.replace(/\[[^\]]+\]/g, randomUUID()) }))
	];
	expect(targets.length).toBeGreaterThan(15);
	const wrong: string[] = [];
	for (const t of targets) {
		for (const [type, encode] of FORM_TYPES) {
			// The request context holds the session cookie, as a browser would (SameSite aside).
			const reply = await request.fetch(t.path, { method: t.method, headers: { origin: EVIL, 'content-type': type }, data: encode({ email: user.email, password: PASSWORD, name: 'from-evil' }), maxRedirects: 0 });
			if (reply.status() !== 403) wrong.push(`${t.method} ${t.path} ${type}: ${reply.status()}`);
		}
	}
	expect(wrong).toEqual([]);
	// Same origin, same form: not refused (the refusals above are about the origin).
	const own = await request.post('/sign-in', { headers: { origin: baseURL!, 'content-type': 'application/x-www-form-urlencoded' }, data: new URLSearchParams({ email: user.email, password: PASSWORD }).toString(), maxRedirects: 0 });
	expect(own.status()).not.toBe(403);
});

test('better-auth refuses sign-in and sign-out posted with a foreign Origin', async ({ request, baseURL }) => {
	const user = await signUp(request, baseURL!, 'Foreign Origin');
	for (const path of ['/api/auth/sign-in/email', '/api/auth/sign-out']) {
		const reply = await request.post(path, { headers: { origin: EVIL }, data: { email: user.email, password: PASSWORD } });
		expect(reply.status(), path).toBe(403);
	}
	expect((await request.get('/api/v1/me')).status()).toBe(200);
});

test('workspace and board names holding markup render as text, never as markup', async ({ page, baseURL }) => {
	const payload = `<img src=x onerror="window.__pwned=1"><script>window.__pwned=2</script>Board`;
	await signUp(page.request, baseURL!, 'Markup');
	const created = await page.request.post('/api/v1/workspaces', { headers: originHeaders(baseURL!), data: { name: `WS ${payload}`, slug: `markup-${randomUUID().slice(0, 8)}` } });
	expect(created.status(), await created.text()).toBe(201);
	const workspaceId = (await created.json()).id;
	const board = await page.request.post(`/api/v1/projects?workspace=${workspaceId}`, { headers: originHeaders(baseURL!), data: { name: payload, description: payload } });
	expect(board.status(), await board.text()).toBe(201);
	const boardId = (await board.json()).id;
	for (const path of [`/w`, `/w/${workspaceId}`, `/w/${workspaceId}/projects/${boardId}`]) {
		await page.goto(path);
		// The markup shows as the characters typed (innerText: only what is rendered and visible).
		await expect.poll(() => page.evaluate(() => document.body.innerText), { message: path }).toContain('<script>window.__pwned=2</script>Board');
		expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned), path).toBeUndefined();
		expect(await page.locator('img[src="x"]').count(), path).toBe(0);
	}
});

test('pages run under the Content-Security-Policy with no violation, and the theme script still runs', async ({ page, baseURL }) => {
	const problems: string[] = [];
	page.on('console', (m) => {
		if (m.type() === 'error') problems.push(`console: ${m.text()}`);
	});
	page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
	// Init scripts come from the browser's debugging protocol, not the page, so the policy does not stop this one.
	await page.addInitScript(() => {
		document.addEventListener('securitypolicyviolation', (e) => {
			const w = window as unknown as { __violations?: string[] };
			(w.__violations ??= []).push(`${e.violatedDirective} ${e.blockedURI}`);
		});
	});
	await signUp(page.request, baseURL!, 'Policy Reader');
	const workspaceId = await createWorkspace(page.request, baseURL!, 'Policy team');
	for (const path of ['/', '/sign-in', '/try', '/w', `/w/${workspaceId}`, `/w/${workspaceId}/templates`]) {
		const response = await page.goto(path);
		expect(response?.headers()['content-security-policy'], path).toMatch(/frame-ancestors 'none'/);
		await page.waitForLoadState('networkidle');
		// The inline theme script in app.html carries the page's nonce, so it ran before first paint.
		expect(await page.evaluate(() => document.documentElement.dataset.theme), path).toMatch(/^(light|dark)$/);
		expect(await page.evaluate(() => (window as unknown as { __violations?: string[] }).__violations ?? []), path).toEqual([]);
	}
	expect(problems).toEqual([]);
});

test('another site cannot frame the app', async ({ page, baseURL }) => {
	// A page of another origin (about:blank with content) framing the sign-in page: Chromium refuses to render it.
	await page.setContent(`<iframe src="${baseURL}/sign-in" width="600" height="400"></iframe>`);
	await page.waitForTimeout(1000);
	const frame = page.frames().find((f) => f !== page.mainFrame());
	const shown = frame ? await frame.evaluate(() => document.body?.innerText ?? '').catch(() => '') : '';
	expect(shown).not.toContain('Sign in');
});

test('a signed-in user sent to /sign-in?redirectTo=/<TAB>/evil.example stays on this site', async ({ page, baseURL }) => {
	await signUp(page.request, baseURL!, 'Redirect Target');
	// [published: WHATWG URL Standard] the browser drops the tab, so an unchecked Location would be //evil.example/phish.
	for (const attack of ['%2F%09%2Fevil.example%2Fphish', '%2F%5Cevil.example', '%2F%2Fevil.example']) {
		await page.goto(`/sign-in?redirectTo=${attack}`);
		expect(new URL(page.url()).origin, attack).toBe(baseURL);
		expect(new URL(page.url()).pathname, attack).toBe('/w');
	}
});

test('sign-up in the browser: the page says to check the mail; the mailed link confirms, signs in and opens the invitation', async ({ page, browser, baseURL }) => {
	const ownerContext = await browser.newContext({ baseURL });
	const owner = ownerContext.request;
	await signUp(owner, baseURL!, 'Inviting Owner');
	const workspaceId = await createWorkspace(owner, baseURL!, 'Confirm team');
	const email = `confirm-${randomUUID().slice(0, 8)}@example.test`;
	const invited = await owner.post(`/api/v1/workspaces/${workspaceId}/invitations`, { headers: originHeaders(baseURL!), data: { email, role: 'engineer' } });
	expect(invited.status()).toBe(201);
	const invitationPath = `/invitations/${(await invited.json()).id}`;

	await page.goto(invitationPath);
	await page.getByRole('link', { name: 'Create an account' }).click();
	await page.getByLabel('Name', { exact: true }).fill('Confirming Engineer');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel(/^Password/).fill(PASSWORD);
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByTestId('sign-up-sent')).toContainText(`We sent a confirmation link to ${email}`);
	expect((await page.request.get('/api/v1/me')).status()).toBe(401);

	const link = await confirmationLink(email);
	await page.goto(link.pathname + link.search);
	await expect(page).toHaveURL(new RegExp(`${invitationPath}$`));
	await page.getByRole('button', { name: 'Accept and open the workspace' }).click();
	await expect(page).toHaveURL(new RegExp(`/w/${workspaceId}$`));
	await ownerContext.close();
});

test('a 50 MB chunked body to an API route of the production build is 413 with the API error body, not 500', async ({ request, baseURL }) => {
	// adapter-node (BODY_SIZE_LIMIT 7M here) and our own 1 MB API limit meet the same upload: ours answers first.
	const user = await signUp(request, baseURL!, 'Big Body');
	const session = await request.post('/api/auth/sign-in/email', { headers: originHeaders(baseURL!), data: { email: user.email, password: PASSWORD } });
	const cookie = (await session.headersArray()).filter((h) => h.name.toLowerCase() === 'set-cookie').map((h) => h.value.split(';')[0]).join('; ');
	for (const path of ['/api/v1/analyze', '/api/v1/workspaces', '/api/auth/sign-in/email']) {
		const reply = await chunkedUpload(baseURL + path, { 'content-type': 'application/json', cookie }, 50 * 1024 * 1024);
		expect(reply.status, `${path}: ${reply.body.slice(0, 200)}`).toBe(413);
		expect(JSON.parse(reply.body).error.code, path).toBe('payload-too-large');
		expect(reply.sent, path).toBeLessThan(25 * 1024 * 1024); // it stopped reading near the limit
	}
});
