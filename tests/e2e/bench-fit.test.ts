// The fit walk-through of the README in the browser: the demo rail (1V0_CORE of the demo seed,
// same stage and design) gets the demo bench file uploaded on its rail screen; the engineer ticks
// the values they doubt, the fit names the polymer capacitor's ESR as what explains the deviation
// with its interval, the fitted values are saved as r2, and r2's review page ranks the sensitivities.
import { DEMO_BENCH, demoBenchDesign } from '../../scripts/demo-bench';
import { gateway } from '../../scripts/demo-rails';
import { expect, originHeaders, test } from './support/fixtures';

test('the demo bench file: upload, fit, the parasitic named with its interval, save, ranked sensitivities on review', async ({ authenticatedAs, baseURL }) => {
	const owner = await authenticatedAs('owner');
	const engineer = await authenticatedAs('engineer', { workspaceId: owner.workspaceId, owner: owner.request });
	const headers = originHeaders(baseURL!);
	const board = await (await owner.request.post(`/api/v1/projects?workspace=${owner.workspaceId}`, { headers, data: { name: DEMO_BENCH.board } })).json();
	const railSeed = gateway.find((r) => r.rail.name === DEMO_BENCH.rail)!;
	const railRes = await owner.request.post(`/api/v1/projects/${board.id}/rails`, { headers, data: railSeed.rail });
	expect(railRes.status(), await railRes.text()).toBe(201);
	const rail = await railRes.json();
	const saved = await engineer.request.post(`/api/v1/rails/${rail.id}/loops`, { headers, data: { baseRevision: null, design: demoBenchDesign(), message: railSeed.revisions[0].message } });
	expect(saved.status(), await saved.text()).toBe(201);

	const page = engineer.page;
	await page.setViewportSize({ width: 1280, height: 1000 });
	await page.goto(`/w/${owner.workspaceId}/projects/${board.id}/rails/${rail.id}`);
	// The first analysis runs in the page; slow on a shared 2-core machine.
	await expect(page.getByTestId('fc-chip')).toBeVisible({ timeout: 30_000 });

	// Upload the demo file as a user would, from the repository's demo/ folder.
	await page.getByTestId('bench-file').setInputFiles(DEMO_BENCH.path);
	await page.getByTestId('bench-upload').click();
	await expect(page.getByTestId('bench-note')).toContainText(`${DEMO_BENCH.fileName}: 161 points read.`);
	await expect(page.getByTestId('bench-deviation')).toBeVisible();

	// Tick the inductor and both capacitor branches' C and ESR, then fit.
	const fit = page.getByTestId('bench-fit');
	await expect(fit).toContainText(`Fit r1 to ${DEMO_BENCH.fileName}`);
	for (const key of ['l', 'c.0', 'esr.0', 'c.1', 'esr.1']) await fit.getByTestId(`fit-param-${key}`).check();
	await fit.getByTestId('fit-run').click();
	const explains = fit.getByTestId('fit-explains');
	await expect(explains).toContainText('ESR (branch 2) explains most of the deviation', { timeout: 30_000 });
	// The interval, in engineering notation, around the 30 mΩ the file was made with (2.5 × 12 mΩ typed).
	await expect(explains).toContainText(/95 %: 2\d\.?\d* mΩ … 3\d\.?\d* mΩ\) against 12 mΩ typed/);
	await expect(fit.getByTestId('fit-residual')).toContainText('before');
	await page.screenshot({ path: 'test-results/bench-fit.png', fullPage: true });

	// Save the fitted values as the next revision.
	const [answer] = await Promise.all([
		page.waitForResponse((r) => r.url().includes('/bench/') && r.url().endsWith('/fit') && r.request().method() === 'POST'),
		fit.getByTestId('fit-save').click()
	]);
	const body = await answer.json();
	expect(body.saved.revision).toBe(2);
	// The page opens r2 and says so above the fit panel, which is made anew for r2.
	await expect(page.getByTestId('fit-saved')).toContainText('Saved the fitted values as r2', { timeout: 30_000 });
	await expect(fit).toContainText(`Fit r2 to ${DEMO_BENCH.fileName}`);

	// r2's review page: the sensitivities, ranked by the phase-margin change at the tolerance (the third number column).
	await page.goto(`/w/${owner.workspaceId}/reviews/${body.saved.id}`);
	const table = page.getByTestId('sensitivity-table');
	await expect(table).toBeVisible({ timeout: 30_000 });
	const rows = table.locator('tbody tr');
	expect(await rows.count()).toBeGreaterThanOrEqual(8);
	const atTol = await rows.evaluateAll((trs) => trs.map((tr) => tr.querySelectorAll('td')[2]?.textContent ?? ''));
	const magnitudes = atTol.map((t) => Math.abs(parseFloat(t.replace('−', '-').replace(/[^0-9.+-]/g, ''))) || 0);
	expect(magnitudes).toEqual([...magnitudes].sort((a, b) => b - a));
	await page.screenshot({ path: 'test-results/bench-fit-review.png', fullPage: true });
});

test('the design screen ranks the sensitivities beside the corners once the input settles, in both themes', async ({ page }) => {
	await page.setViewportSize({ width: 1280, height: 1000 });
	await page.goto('/try');
	await expect(page.getByTestId('bode-plot')).toBeVisible({ timeout: 30_000 });
	await page.getByTestId('tab-corners').click();
	const panel = page.getByTestId('design-sensitivity');
	await expect(panel).toHaveAttribute('data-state', 'final', { timeout: 30_000 });
	await expect(panel.getByTestId('sensitivity-summary')).toContainText('moves the phase margin most');
	// The same ranked table as the review page: largest phase-margin change first.
	const rows = panel.getByTestId('sensitivity-table').locator('tbody tr');
	expect(await rows.count()).toBeGreaterThanOrEqual(6);
	const first = (await rows.first().locator('th').textContent())!.trim();
	await expect(panel.getByTestId('sensitivity-summary')).toContainText(first);
	for (const theme of ['light', 'dark']) {
		await page.evaluate((t) => (document.documentElement.dataset.theme = t), theme);
		await panel.scrollIntoViewIfNeeded();
		await page.screenshot({ path: `test-results/design-sensitivity-${theme}.png`, fullPage: true });
	}
});
