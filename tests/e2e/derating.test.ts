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

test('a DC-bias curve, forced CCM and loss part data are inputs of the design screen', async ({ page }) => {
	await page.setViewportSize({ width: 1280, height: 1000 });
	await page.goto('/try');
	await expect(page.getByTestId('verdict')).toBeVisible();
	// Curve C0/(1 + (V/V0)^k) at Vout = 1.2 V with V0 = 1.2 V, k = 2: 47 µF/2 = 23.5 µF [hand-derived]
	await page.locator('#cap-0-biasKind').selectOption('curve');
	await page.locator('#cap-0-biasV0').fill('1.2');
	await page.locator('#cap-0-biasK').fill('2');
	await expect(page.getByTestId('cap-effective-0')).toContainText('23.5 µF effective');
	// Forced CCM: the Mode line no longer says the stage leaves CCM.
	await page.getByTestId('select-light-load').selectOption('forced-ccm');
	await expect(page.getByTestId('op-mode')).toContainText('CCM at every load');
	// Loss part data: a rise time counts switching loss, and the basis says part data were used.
	await page.getByTestId('loss-inputs').locator('summary').click();
	await page.locator('#losses-riseTime').fill('10n');
	await expect(page.getByTestId('losses')).toContainText('conduction and part data');
	await expect(page.getByTestId('losses')).toContainText('switching');
	await page.locator('#losses-qg').fill('1m');
	await page.locator('#losses-qg').blur();
	await expect(page.getByTestId('error-losses-qg')).toContainText('must be ≤ 10 µC');
});
