// The rail screen's History in Chromium: an engineer saves r1, changes L and saves r2, then
// ticks both revisions and sees the inductor among the differences and two loop gains on one
// plot; a viewer of the same rail gets no Save form and no editable design inputs.
// Screenshots of the History panel in both themes go to test-results/ for review (not committed).
import { expect, originHeaders, test } from './support/fixtures';

test('an engineer compares r1 with r2; a viewer sees the rail read-only', async ({ baseURL, authenticatedAs }) => {
	test.setTimeout(120_000);
	const owner = await authenticatedAs('owner');
	const into = { workspaceId: owner.workspaceId, owner: owner.request };
	const origin = originHeaders(baseURL!);
	const project = await (await owner.request.post(`/api/v1/projects?workspace=${owner.workspaceId}`, { headers: origin, data: { name: 'History board' } })).json();
	const railRes = await owner.request.post(`/api/v1/projects/${project.id}/rails`, {
		headers: origin,
		data: { name: 'VCORE_1V0', topology: 'buck', vout: 1.0, vinNom: 12, vinMin: 10, vinMax: 14, ioutNom: 5, ioutMin: 1, ioutMax: 8, fsw: 500e3 }
	});
	expect(railRes.status(), await railRes.text()).toBe(201);
	const rail = await railRes.json();
	const url = `/w/${owner.workspaceId}/projects/${project.id}/rails/${rail.id}`;

	const { page } = await authenticatedAs('engineer', into);
	await page.setViewportSize({ width: 1440, height: 1000 });
	await page.goto(url);
	await expect(page.getByTestId('fc-chip')).toBeVisible();
	await page.getByLabel('What changed').fill('Starter design');
	await page.getByTestId('save-button').click();
	await expect(page.getByTestId('save-note')).toContainText('Saved as r1');

	const chip = await page.getByTestId('fc-chip').textContent();
	await page.getByTestId('field-l').fill('2.2u');
	await expect(page.getByTestId('fc-chip')).not.toHaveText(chip!);
	await page.getByLabel('What changed').fill('Smaller inductor');
	await expect(page.getByTestId('save-button')).toHaveText('Save as r2');
	await page.getByTestId('save-button').click();
	await expect(page.getByTestId('save-note')).toContainText('Saved as r2');

	await page.getByTestId('history-toggle').click();
	const history = page.getByTestId('history');
	await expect(history.getByTestId('history-row')).toHaveCount(2);
	await expect(history.getByTestId('history-row').first()).toContainText('Smaller inductor');
	await history.getByLabel('Compare r1').check();
	await history.getByLabel('Compare r2').check();

	const l = history.locator('[data-testid="history-change"][data-path="plant.inductor.l"]');
	await expect(l).toBeVisible();
	await expect(l).toContainText('2.2 µH');
	// Two loop-gain traces (r2 solid, r1 dotted) in the magnitude and the phase panel.
	const plot = history.getByTestId('history-plot');
	await expect(plot.locator('path[data-kind="loop"][data-quantity="mag"]')).toHaveCount(2);
	await expect(plot.locator('path[data-kind="loop"][data-quantity="phase"]')).toHaveCount(2);
	const [d1, d2] = await plot.locator('path[data-kind="loop"][data-quantity="mag"]').evaluateAll((ps) => ps.map((p) => p.getAttribute('d')));
	expect(d1).not.toEqual(d2);

	await history.scrollIntoViewIfNeeded();
	for (const theme of ['light', 'dark']) {
		await page.evaluate((t) => (document.documentElement.dataset.theme = t), theme);
		await history.screenshot({ path: `test-results/history-${theme}.png` });
	}

	const viewer = await authenticatedAs('viewer', into);
	await viewer.page.setViewportSize({ width: 1440, height: 1000 });
	await viewer.page.goto(url);
	await expect(viewer.page.getByTestId('rail-revision')).toContainText('r2');
	await expect(viewer.page.getByTestId('readonly-note')).toBeVisible();
	await expect(viewer.page.getByTestId('save-form')).toHaveCount(0);
	await expect(viewer.page.getByTestId('save-button')).toHaveCount(0);
	const inputs = viewer.page.getByRole('complementary', { name: 'Design inputs' }).locator('input, select, textarea');
	expect(await inputs.count()).toBeGreaterThan(0);
	const editable = await inputs.evaluateAll((els) => els.filter((e) => !(e as HTMLInputElement).disabled && !(e as HTMLInputElement).readOnly).map((e) => e.id || e.getAttribute('name') || e.outerHTML.slice(0, 80)));
	expect(editable, 'design inputs a viewer could edit').toEqual([]);
	// The panels' own copies of the design's part tolerances too (Corners and Spread): before,
	// a viewer could type them and the screen re-analysed a design they cannot save.
	for (const tab of ['corners', 'spread']) {
		await viewer.page.getByTestId(`tab-${tab}`).click();
		const tolerances = viewer.page.getByTestId(`${tab}-tolerances`).locator('input, select');
		await expect(tolerances.first()).toBeVisible();
		const open = await tolerances.evaluateAll((els) => els.filter((e) => !(e as HTMLInputElement).disabled && !(e as HTMLInputElement).readOnly).map((e) => e.id || e.outerHTML.slice(0, 80)));
		expect(open, `${tab} tolerances a viewer could edit`).toEqual([]);
	}
});
