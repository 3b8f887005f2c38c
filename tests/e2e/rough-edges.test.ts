// Rough edges of the signed-in screens: each test failed before its fix.
import { expect, originHeaders, test, type SignedIn } from './support/fixtures';

const BUCK = { name: 'VDD_1V8', topology: 'buck', vout: 1.8, vinNom: 12, vinMin: 10, vinMax: 14, ioutNom: 3, ioutMin: 1, ioutMax: 4, fsw: 500e3 };

/** A board with one rail (through the API); the rail screen's address. */
async function boardWithRail(owner: SignedIn, baseURL: string, rail: Record<string, unknown> = BUCK) {
	const headers = originHeaders(baseURL);
	const project = await (await owner.request.post(`/api/v1/projects?workspace=${owner.workspaceId}`, { headers, data: { name: `Board ${rail.name}` } })).json();
	const res = await owner.request.post(`/api/v1/projects/${project.id}/rails`, { headers, data: rail });
	expect(res.status(), await res.text()).toBe(201);
	const made = await res.json();
	return { projectId: project.id as string, railId: made.id as string, url: `/w/${owner.workspaceId}/projects/${project.id}/rails/${made.id}` };
}

test('unsaved edits ask before leaving; nothing changed or just saved leaves quietly', async ({ authenticatedAs, baseURL }) => {
	const owner = await authenticatedAs('owner');
	const { url } = await boardWithRail(owner, baseURL!);
	const page = owner.page;
	await page.setViewportSize({ width: 1280, height: 800 });
	const dialogs: string[] = [];
	page.on('dialog', (d) => {
		dialogs.push(d.message());
		void d.dismiss();
	});
	// Opened and left untouched: no question.
	await page.goto(url);
	await expect(page.getByTestId('fc-chip')).toBeVisible();
	await page.getByTestId('rail-board-link').click();
	await expect(page).not.toHaveURL(url);
	expect(dialogs).toEqual([]);
	// An edit, then the board link: asked, and staying keeps the edit.
	await page.goto(url);
	await expect(page.getByTestId('fc-chip')).toBeVisible();
	await page.getByTestId('field-l').fill('6.8u');
	await expect(page.getByTestId('verdict')).toHaveAttribute('data-state', 'final', { timeout: 30_000 });
	await page.getByTestId('rail-board-link').click();
	await expect.poll(() => dialogs.length).toBe(1);
	expect(dialogs[0]).toContain('not saved');
	await expect(page).toHaveURL(url);
	await expect(page.getByTestId('field-l')).toHaveValue('6.8u');
	// Saved: leaving is quiet again.
	await page.getByLabel('What changed').fill('Larger inductor');
	await page.getByTestId('save-button').click();
	await expect(page.getByTestId('save-note')).toContainText('Saved as r1');
	await page.getByTestId('rail-board-link').click();
	await expect(page).not.toHaveURL(url);
	expect(dialogs).toHaveLength(1);
});

test('the review page draws its plot in the page theme (dark stays dark) at 1280 px', async ({ authenticatedAs, baseURL }) => {
	const owner = await authenticatedAs('owner');
	const { url } = await boardWithRail(owner, baseURL!);
	const page = owner.page;
	await page.setViewportSize({ width: 1280, height: 800 });
	await page.goto(url);
	await page.getByLabel('What changed').fill('Starter');
	await expect(page.getByTestId('save-button')).toBeEnabled({ timeout: 30_000 });
	await page.getByTestId('save-button').click();
	await expect(page.getByTestId('save-note')).toContainText('Saved as r1');
	const loops = await (await page.request.get(`/api/v1/rails/${url.split('/').pop()}/loops?limit=1`)).json();
	await page.goto(`/w/${owner.workspaceId}/reviews/${loops.items[0].id}`);
	const plot = page.getByTestId('review-plot');
	await expect(plot.locator('svg').first()).toBeVisible();
	const colours: Record<string, { panel: string; axis: string }> = {};
	for (const theme of ['light', 'dark']) {
		await page.evaluate((t) => (document.documentElement.dataset.theme = t), theme);
		colours[theme] = await plot.evaluate((el) => {
			const text = el.querySelector('svg text') as SVGTextElement;
			const panel = el.closest('section') as HTMLElement;
			return { panel: getComputedStyle(panel).backgroundColor, axis: getComputedStyle(text).fill };
		});
		await page.screenshot({ path: `test-results/review-1280-${theme}.png` });
	}
	// The panel behind the plot and the plot's own text change with the theme.
	expect(colours.dark.panel).not.toBe(colours.light.panel);
	expect(colours.dark.axis).not.toBe(colours.light.axis);
});
