// The switching check kept with a revision, in the browser: a reviewer opens the review page of
// a saved light-load boost, runs the check on the server with the page's button, and the page
// shows the switching PM beside the averaged one with the caution (the case of
// reference/switching, where ngspice's switching transient sides with the lower PM).
import { readFileSync } from 'node:fs';
import { expect, originHeaders, test } from './support/fixtures';

const BOOST = JSON.parse(readFileSync('reference/switching/cases/boost-5v-12v-light.json', 'utf8'));
const RAIL = { name: 'BOOST_12V', topology: 'boost', vout: 12, vinNom: 5, vinMin: 5, vinMax: 5, ioutNom: 0.1, ioutMin: 0.1, ioutMax: 0.1, fsw: 400e3 };

test('a reviewer runs the switching check on the server and the review page keeps it', async ({ authenticatedAs, baseURL }) => {
	// The save verifies every tolerance corner and the check runs several seconds, on a shared 2-core machine.
	test.setTimeout(240_000);
	const owner = await authenticatedAs('owner');
	const reviewer = await authenticatedAs('reviewer', { workspaceId: owner.workspaceId, owner: owner.request });
	const headers = originHeaders(baseURL!);
	const project = await (await owner.request.post(`/api/v1/projects?workspace=${owner.workspaceId}`, { headers, data: { name: 'Switching board' } })).json();
	const rail = await (await owner.request.post(`/api/v1/projects/${project.id}/rails`, { headers, data: RAIL })).json();
	const saved = await owner.request.post(`/api/v1/rails/${rail.id}/loops`, { headers, data: { baseRevision: null, design: BOOST, message: 'light-load boost' } });
	expect(saved.status(), await saved.text()).toBe(201);
	const loop = await saved.json();

	const page = reviewer.page;
	await page.setViewportSize({ width: 1280, height: 1000 });
	await page.goto(`/w/${owner.workspaceId}/reviews/${loop.id}`);
	const section = page.getByTestId('review-switching');
	await expect(section.getByTestId('review-switching-none')).toBeVisible();
	await section.getByTestId('review-switching-run').click();
	await expect(section.getByTestId('switching-caution')).toContainText('differs from the averaged', { timeout: 150_000 });
	await expect(section.getByTestId('switching-pm')).toHaveText(/\d+(\.\d+)?\s*°/);
	await expect(section.getByTestId('review-switching-when')).toContainText('kept with this revision');
	// Kept: a reload shows it without running again, and the button is gone (current engine).
	await page.reload();
	await expect(section.getByTestId('switching-caution')).toBeVisible();
	await expect(section.getByTestId('review-switching-run')).toHaveCount(0);

	if (process.env.SCREENSHOT_DIR) {
		for (const theme of ['light', 'dark'] as const) {
			await page.evaluate((t) => localStorage.setItem('loopwright-theme', t), theme);
			await page.reload();
			await expect(page.locator('html')).toHaveAttribute('data-theme', theme);
			await section.scrollIntoViewIfNeeded();
			await page.screenshot({ path: `${process.env.SCREENSHOT_DIR}/review-switching-${theme}.png` });
		}
	}
});
