// The rail design screen behind sign-in: a new engineer's rail opens with a starter design,
// an edit is saved as revision r1 with a message, and a reload shows the saved state.
import { expect, test } from '@playwright/test';
import { randomUUID } from 'node:crypto';
import { signUp } from './support/fixtures';

test('an owner opens a rail, changes L, saves r1 and sees it after a reload', async ({ page, baseURL }) => {
	const origin = { origin: baseURL! };
	const tag = randomUUID().slice(0, 8);
	await signUp(page.request, baseURL!, 'Rail Tester');
	const ws = await (await page.request.post('/api/v1/workspaces', { headers: origin, data: { name: `Rail ${tag}`, slug: `rail-${tag}` } })).json();
	const project = await (await page.request.post(`/api/v1/projects?workspace=${ws.id}`, { headers: origin, data: { name: 'Test board' } })).json();
	const railRes = await page.request.post(`/api/v1/projects/${project.id}/rails`, {
		headers: origin,
		data: { name: 'VDD_1V8', topology: 'buck', vout: 1.8, vinNom: 12, vinMin: 10, vinMax: 14, ioutNom: 3, ioutMin: 1, ioutMax: 4, fsw: 500e3 }
	});
	expect(railRes.status()).toBe(201);
	const rail = await railRes.json();

	await page.setViewportSize({ width: 1440, height: 1000 });
	await page.goto(`/w/${ws.id}/projects/${project.id}/rails/${rail.id}`);
	await expect(page.getByTestId('rail-name')).toHaveText('VDD_1V8');
	await expect(page.getByTestId('rail-revision')).toContainText('starter');
	await expect(page.getByTestId('fc-chip')).toBeVisible();
	const chip = await page.getByTestId('fc-chip').textContent();
	await page.getByTestId('field-l').fill('6.8u');
	await expect(page.getByTestId('fc-chip')).not.toHaveText(chip!);
	await page.getByLabel('What changed').fill('Larger inductor for less ripple');
	await page.getByTestId('save-button').click();
	await expect(page.getByTestId('save-note')).toContainText('Saved as r1');
	await page.reload();
	await expect(page.getByTestId('rail-revision')).toContainText('r1');
	await expect(page.getByTestId('field-l')).toHaveValue('6.8µH');
	await page.screenshot({ path: 'test-results/rail-design.png', fullPage: true });
});

test('the rail screen sends a signed-out visitor to sign in', async ({ page }) => {
	await page.goto('/w/x/projects/y/rails/z');
	await expect(page).toHaveURL(/\/sign-in\?redirectTo=/);
});
