// The design screen without a mouse (WAI-ARIA authoring practices: slider and
// tabs) and its critical-frequency marks, on the public sandbox's demo buck (E96/E12 parts).
// Before this change plain arrows on a marker were rounded away by the E12 capacitors and the tab
// bar ignored arrow keys: both tests below failed on the old screen.
import { expect, test, type Page } from '@playwright/test';

async function openSandbox(page: Page) {
	await page.setViewportSize({ width: 1280, height: 800 });
	await page.goto('/try');
	await expect(page.getByTestId('fc-chip')).toBeVisible({ timeout: 20_000 });
}

test('a pole/zero marker is a slider: plain ArrowUp/ArrowDown move the value shown', async ({ page }) => {
	await openSandbox(page);
	const zero = page.getByRole('slider', { name: /^Zero fz1/ });
	await expect(zero).toHaveAttribute('aria-valuetext', /Hz$/);
	const text0 = (await zero.getAttribute('aria-valuetext'))!;
	const now0 = Number(await zero.getAttribute('aria-valuenow'));
	await zero.focus();
	await page.keyboard.press('ArrowUp');
	await expect(zero).not.toHaveAttribute('aria-valuetext', text0);
	const now1 = Number(await zero.getAttribute('aria-valuenow'));
	expect(now1).toBeGreaterThan(now0);
	// The marker keeps the focus through the re-analysis, so presses chain.
	await expect(zero).toBeFocused();
	const text1 = (await zero.getAttribute('aria-valuetext'))!;
	await page.keyboard.press('ArrowDown');
	await expect(zero).not.toHaveAttribute('aria-valuetext', text1);
	expect(Number(await zero.getAttribute('aria-valuenow'))).toBeLessThan(now1);
	// The network's field follows the marker (manual placement, the same as a drag).
	await expect(page.getByTestId('verdict')).toHaveAttribute('data-state', 'final');
	const pole = page.getByRole('slider', { name: /^Pole fp/ }).last();
	const poleText = (await pole.getAttribute('aria-valuetext'))!;
	await pole.focus();
	await page.keyboard.press('PageDown');
	await expect(pole).not.toHaveAttribute('aria-valuetext', poleText);
});

test('the panel tabs follow the tabs pattern: one tab stop, arrows, Home and End', async ({ page }) => {
	await openSandbox(page);
	const tabs = page.getByRole('tablist', { name: 'Panels' }).getByRole('tab');
	const names = await tabs.allTextContents();
	expect(names.length).toBeGreaterThan(3);
	// Only the selected tab is in the tab order.
	await expect(tabs.nth(0)).toHaveAttribute('tabindex', '0');
	await expect(tabs.nth(1)).toHaveAttribute('tabindex', '-1');
	await tabs.nth(0).focus();
	await page.keyboard.press('ArrowRight');
	await expect(tabs.nth(1)).toBeFocused();
	await expect(tabs.nth(1)).toHaveAttribute('aria-selected', 'true');
	await expect(page.getByRole('tabpanel')).toBeVisible();
	await page.keyboard.press('End');
	await expect(tabs.nth(names.length - 1)).toBeFocused();
	await expect(tabs.nth(names.length - 1)).toHaveAttribute('aria-selected', 'true');
	await page.keyboard.press('ArrowRight'); // wraps to the first
	await expect(tabs.nth(0)).toHaveAttribute('aria-selected', 'true');
	await page.keyboard.press('ArrowLeft'); // wraps to the last
	await expect(tabs.nth(names.length - 1)).toBeFocused();
	await page.keyboard.press('Home');
	await expect(tabs.nth(0)).toBeFocused();
	await expect(tabs.nth(0)).toHaveAttribute('aria-selected', 'true');
	await expect(page.getByTestId('bode-plot')).toBeVisible();
});

test('critical frequencies are labelled on the plot: LC f0, ESR zero, fsw/2 and the crossover target', async ({ page }) => {
	await openSandbox(page);
	const marks = page.getByTestId('freq-marker');
	for (const id of ['f0', 'esr', 'half-fsw', 'fc-target']) await expect(marks.and(page.locator(`[data-marker="${id}"]`)).first()).toBeVisible();
	await expect(page.locator('[data-marker="half-fsw"] text')).toHaveText('fsw/2 300 kHz'); // the demo's fsw is 600 kHz
	await expect(page.locator('[data-marker="fc-target"] text')).toHaveText('fc target 60 kHz');
	await expect(page.getByTestId('freq-marker-list')).toContainText('LC f0');
	for (const theme of ['light', 'dark']) {
		await page.evaluate((t) => (document.documentElement.dataset.theme = t), theme);
		await page.screenshot({ path: `test-results/design-1280-${theme}.png` });
	}
});

test('input-filter tab: an empty Rd (no damping, as its help says) is not marked as an error', async ({ page }) => {
	await openSandbox(page);
	await page.getByTestId('tab-filter').click();
	const rd = page.getByTestId('field-filter-rd');
	await expect(rd).toHaveValue('');
	await rd.focus();
	await page.getByTestId('field-filter-cd').focus(); // Rd left empty
	await expect(page.getByTestId('error-filter-rd')).toHaveCount(0);
	await expect(rd).not.toHaveAttribute('aria-invalid', 'true');
	// Frequencies in its verdict are in engineering notation, never "near 50400 Hz".
	await expect(page.getByTestId('filter-verdict')).toBeVisible();
	await expect(page.getByTestId('filter-verdict')).not.toContainText(/\d{4,} Hz/);
	// A value that cannot be read still is.
	await rd.fill('4.7x');
	await page.getByTestId('field-filter-cd').focus();
	await expect(page.getByTestId('error-filter-rd')).toContainText('unknown prefix');
});
