// The design screen shows each capacitor branch's effective value beside the typed one once a
// derating is entered, and names a bad class code at its field.
import { expect, test } from '@playwright/test';

test('a DC-bias point shows the effective capacitance beside the typed one, and moves the verdict', async ({ page }) => {
	await page.setViewportSize({ width: 1440, height: 1000 });
	await page.goto('/try');
	await expect(page.getByTestId('verdict')).toBeVisible();
	await expect(page.getByTestId('cap-effective-0')).toHaveCount(0);
	const pmBefore = await page.getByTestId('verdict-pm-value').textContent();
	await page.locator('#cap-0-biasV').fill('1.2');
	await page.locator('#cap-0-biasC').fill('20u');
	// Typed 47 µF, effective 20 µF at Vout = 1.2 V (the point itself) [hand-derived]
	await expect(page.getByTestId('cap-effective-0')).toContainText('47 µF typed');
	await expect(page.getByTestId('cap-effective-0')).toContainText('20 µF effective');
	await expect(page.getByTestId('verdict-pm-value')).not.toHaveText(pmBefore!);
	await page.locator('#cap-0-tempClass').fill('X9Q');
	await expect(page.getByTestId('cap-derating-0')).toContainText('must be a class code');
});
