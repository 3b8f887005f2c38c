// The switching check of a peak current-mode design on the public sandbox (/try): the production
// worker runs the switching model with the comparator of peak current mode and shows its figures
// and the orbit's reading, never a refusal. Screenshots in both themes go to test-results/.
import { expect, test } from '@playwright/test';

for (const theme of ['light', 'dark']) {
	test(`a peak current-mode design gets its switching check in the worker (${theme})`, async ({ page }) => {
		await page.addInitScript((t) => localStorage.setItem('loopwright-theme', t), theme);
		await page.setViewportSize({ width: 1280, height: 1000 });
		await page.goto('/try');
		await expect(page.getByTestId('verdict')).toBeVisible();
		await page.getByTestId('select-control').selectOption('peak-current');
		await page.getByTestId('tab-switching').click();
		await page.getByTestId('switching-run').click();
		const panel = page.getByTestId('switching-panel');
		await expect(page.getByTestId('switching-figures')).toBeVisible({ timeout: 90_000 });
		await expect(page.getByTestId('switching-not-run')).toHaveCount(0);
		// [common practice] a PM is a finite angle in degrees
		await expect(page.getByTestId('switching-pm')).toHaveText(/-?\d+(\.\d+)?\s*°/);
		expect(await panel.innerText()).not.toMatch(/NaN|Infinity|not in the switching model/);
		await page.screenshot({ path: `test-results/switching-current-mode-${theme}.png`, fullPage: true });
	});
}
