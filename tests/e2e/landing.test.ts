import { expect, test } from '@playwright/test';

test('the landing page says what Loopwright is for, with bundled fonts and no off-machine request', async ({ page }) => {
	const offMachine: string[] = [];
	page.on('request', (request) => {
		const host = new URL(request.url()).hostname;
		if (host !== '127.0.0.1' && host !== 'localhost' && !request.url().startsWith('data:')) offMachine.push(request.url());
	});
	await page.goto('/');
	await expect(page.getByRole('heading', { level: 1 })).toContainText('feedback loop');
	await expect(page.getByTestId('safety-note')).toContainText('Confirm margins');
	await page.evaluate(() => document.fonts.ready);
	const families = await page.evaluate(() => [...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family));
	expect(families.some((f) => f.includes('JetBrains Mono'))).toBe(true);
	expect(families.some((f) => f.includes('Inter'))).toBe(true);
	expect(offMachine).toEqual([]);
});

test('the theme toggle switches to the dark palette and remembers it', async ({ page }) => {
	await page.goto('/');
	const before = await page.evaluate(() => getComputedStyle(document.body).backgroundColor);
	await page.getByTestId('theme-toggle').click();
	await expect(page.locator('html')).toHaveAttribute('data-theme', /dark|light/);
	const after = await page.evaluate(() => getComputedStyle(document.body).backgroundColor);
	expect(after).not.toBe(before);
	await page.reload();
	expect(await page.evaluate(() => getComputedStyle(document.body).backgroundColor)).toBe(after);
});

test('/api/health reports the database as up', async ({ request }) => {
	const res = await request.get('/api/health');
	expect(res.status()).toBe(200);
	expect(await res.json()).toEqual({ status: 'ok', db: 'up', analyses: { threads: expect.any(Number), running: 0, waiting: 0 } });
});
