// The signed-in navigation in Chromium: a new user starts a workspace and a board, adds two
// rails through the form (a bad value is refused at its field, by the shared schema in the
// browser and by the API), sees them in the board health table, sorts and filters it and
// opens a rail's design screen from it; a viewer sees the same table with no edit controls.
// Screenshots of the pages in both themes go to test-results/ for review (not committed).
import { buckDesign } from '../integration/support/designs';
import { expect, originHeaders, signUp, test } from './support/fixtures';
import { BoardPage, WorkspaceHome, WorkspacesHome } from './support/pages';

const RAIL_5V0 = { name: '5V0_MAIN', topology: 'buck', vout: '5', vinMin: '9', vinNom: '12', vinMax: '16', ioutMin: '200m', ioutNom: '2', ioutMax: '3', fsw: '500k' } as const;
const RAIL_1V8 = { name: 'VDD_1V8', topology: 'buck', vout: '1.8V', vinMin: '4.5', vinNom: '5', vinMax: '5.5', ioutMin: '0.1', ioutNom: '1', ioutMax: '1.5', fsw: '1.2MEG' } as const;

async function shoot(page: import('@playwright/test').Page, name: string) {
	await page.evaluate(() => (document.documentElement.dataset.theme = 'light'));
	await page.screenshot({ path: `test-results/nav-${name}-light.png`, fullPage: true });
	await page.evaluate(() => (document.documentElement.dataset.theme = 'dark'));
	await page.screenshot({ path: `test-results/nav-${name}-dark.png`, fullPage: true });
	await page.evaluate(() => (document.documentElement.dataset.theme = 'light'));
}

test('a new user goes from an empty home to a board health table and a rail design screen', async ({ page, baseURL, authenticatedAs }) => {
	test.setTimeout(120_000);
	await page.setViewportSize({ width: 1280, height: 900 });
	const me = await signUp(page.request, baseURL!, 'Nav Owner');

	// Home: no workspace yet, so the create form is the way on.
	const home = new WorkspacesHome(page);
	await home.open();
	await expect(page.getByTestId('nav-user')).toHaveText(me.name);
	await expect(page.getByTestId('workspaces-empty')).toBeVisible();
	await shoot(page, 'home-empty');
	const slug = `nav-${Date.now().toString(36)}`;
	await home.create('Nav Test Team', slug);
	await expect(page).toHaveURL(/\/w\/[0-9a-f-]{36}$/);
	const workspaceId = page.url().split('/w/')[1];
	await expect(page.getByTestId('workspace-name')).toHaveText('Nav Test Team');
	await expect(page.getByTestId('workspace-switcher')).toContainText('Nav Test Team');
	await expect(page.getByTestId('boards-empty')).toBeVisible();
	await expect(page.getByTestId('member-table')).toContainText(me.email);

	// A board.
	await new WorkspaceHome(page).addBoard('Gateway main board', 'Rev B, two bucks');
	await expect(page).toHaveURL(/\/projects\/[0-9a-f-]{36}$/);
	await expect(page.getByTestId('board-name')).toHaveText('Gateway main board');
	await expect(page.getByTestId('rails-empty')).toBeVisible();
	await expect(page.getByTestId('board-switcher')).toContainText('Gateway main board');
	const projectId = page.url().split('/projects/')[1];

	// First rail, typed in engineering notation.
	const board = new BoardPage(page);
	await board.openNewRail();
	// Nothing is marked before the user types or submits (every field was red at once).
	await expect(board.form.locator('[aria-invalid="true"]')).toHaveCount(0);
	await expect(board.form.locator('[data-testid^="error-"]')).toHaveCount(0);
	await board.form.getByTestId('field-vout').focus();
	await board.form.getByTestId('field-fsw').focus();
	await expect(board.fieldError('vout')).toHaveText('enter a value'); // judged once left
	await board.fillRail(RAIL_5V0);
	await board.saveRail();
	// A new rail opens on its design screen; back on the board it is listed.
	await expect(page).toHaveURL(/\/rails\/[^/]+$/);
	await expect(page.getByTestId('rail-name')).toHaveText('5V0_MAIN');
	await page.goBack();
	await expect(board.row('5V0_MAIN')).toBeVisible();
	await expect(board.row('5V0_MAIN')).toContainText('500 kHz');
	await expect(board.row('5V0_MAIN')).toContainText('200 mA–3 A');

	// Second rail: a value the units parser cannot read, and one the rail schema refuses
	// (a buck's lowest input must exceed its output), each shown at its own field.
	await board.openNewRail();
	await board.fillRail({ ...RAIL_1V8, fsw: '1,2MEG' });
	await board.saveRail();
	await expect(board.fieldError('fsw')).toContainText('use a point for decimals');
	await board.fillRail({ fsw: RAIL_1V8.fsw, vinMin: '1.5' });
	await board.saveRail();
	await expect(board.fieldError('vinMin')).toHaveText('a buck needs vinMin > vout');
	await shoot(page, 'rail-form-errors');
	await expect(board.form.getByTestId('field-vinMin')).toHaveAttribute('aria-invalid', 'true');
	await expect(board.rows()).toHaveCount(1);
	await board.fillRail({ vinMin: RAIL_1V8.vinMin });
	// A name already on the board passes the browser's checks; the API's 409 lands at the name field.
	await board.fillRail({ ...RAIL_1V8, name: '5V0_MAIN' });
	await board.saveRail();
	await expect(board.fieldError('name')).toContainText('already exists');
	await board.fillRail({ name: 'VDD_1V8' });
	await board.saveRail();
	await expect(page.getByTestId('rail-name')).toHaveText('VDD_1V8');
	await page.goBack();
	await expect(board.rows()).toHaveCount(2);
	await expect(board.row('VDD_1V8')).toContainText('1.2 MHz');

	// A saved loop on 5V0_MAIN (through the API, as the design screen saves it) gives the table
	// its worst-case margins with verdicts in words.
	const rails = await (await page.request.get(`/api/v1/projects/${projectId}/rails`)).json();
	const rail5 = rails.items.find((r: { name: string }) => r.name === '5V0_MAIN');
	const saved = await page.request.post(`/api/v1/rails/${rail5.id}/loops`, {
		headers: originHeaders(baseURL!),
		data: { baseRevision: null, design: buckDesign(), message: 'First network' }
	});
	expect(saved.status(), await saved.text()).toBe(201);
	await page.reload();
	const row5 = board.row('5V0_MAIN');
	await expect(row5.getByTestId('cell-revision')).toHaveText('r1');
	await expect(row5.getByTestId('cell-pm')).toContainText('°');
	await expect(row5.getByTestId('cell-pm').locator('[data-status]')).toHaveText(/pass|caution|fail/);
	await expect(row5.getByTestId('cell-gm')).toContainText(/dB|no −180°/);
	await expect(row5.getByTestId('cell-fc')).toContainText('Hz');
	await expect(row5.getByTestId('cell-verdict').locator('[data-status]')).toHaveText(/pass|caution|fail/);
	await expect(row5.getByTestId('cell-status')).toHaveText('draft');
	await expect(board.row('VDD_1V8').getByTestId('cell-verdict')).toContainText('no loop');
	// The fc chip's reason names the corner that sets the worst case.
	expect(await row5.getByTestId('cell-fc').locator('[data-status]').getAttribute('title')).toMatch(/Vin (min|nom|max), Iout (min|nom|max)/);

	// Sorting: by name (default, ascending), by Vout both ways, by fsw.
	expect(await board.railNames()).toEqual(['5V0_MAIN', 'VDD_1V8']);
	await board.sortBy('vout');
	expect(await board.railNames()).toEqual(['VDD_1V8', '5V0_MAIN']);
	await expect(page.getByTestId('sort-vout').locator('xpath=..')).toHaveAttribute('aria-sort', 'ascending');
	await board.sortBy('vout');
	expect(await board.railNames()).toEqual(['5V0_MAIN', 'VDD_1V8']);
	await expect(page.getByTestId('sort-vout').locator('xpath=..')).toHaveAttribute('aria-sort', 'descending');
	await board.sortBy('fsw');
	expect(await board.railNames()).toEqual(['5V0_MAIN', 'VDD_1V8']);

	// Filtering by text and by review status.
	await page.getByTestId('rail-filter').fill('1v8');
	expect(await board.railNames()).toEqual(['VDD_1V8']);
	await expect(page.getByTestId('rail-count')).toHaveText('1 of 2 rails');
	await page.getByTestId('rail-filter').fill('');
	await page.getByTestId('status-filter').selectOption('draft');
	expect(await board.railNames()).toEqual(['5V0_MAIN']);
	await page.getByTestId('status-filter').selectOption('approved');
	await expect(page.getByTestId('rails-filtered-out')).toBeVisible();
	await page.getByTestId('status-filter').selectOption('');

	// Editing a rail through the same form.
	await board.row('VDD_1V8').getByTestId('rail-edit').click();
	await expect(board.form.getByTestId('field-fsw')).toHaveValue('1.2MHz');
	await board.fillRail({ ioutMax: '2' });
	await board.saveRail();
	await expect(board.row('VDD_1V8')).toContainText('100 mA–2 A');
	await shoot(page, 'board');

	// The workspace page lists the board with its rail count.
	await page.goto(`/w/${workspaceId}`);
	await expect(page.getByTestId('board-list')).toContainText('2 rails');
	await shoot(page, 'workspace');
	await page.getByTestId('board-switcher').locator('summary').click();
	await expect(page.getByTestId('board-switcher').getByRole('link', { name: /Gateway main board/ })).toBeVisible();
	await page.screenshot({ path: 'test-results/nav-board-menu.png' });
	await page.getByTestId('board-switcher').getByRole('link', { name: /Gateway main board/ }).click();
	await expect(page.getByTestId('board-name')).toHaveText('Gateway main board');

	// From the table to the rail's design screen, and back through its breadcrumb.
	await board.row('5V0_MAIN').getByTestId('rail-link').click();
	await expect(page).toHaveURL(new RegExp(`/w/${workspaceId}/projects/${projectId}/rails/${rail5.id}$`));
	await expect(page.getByTestId('rail-name')).toHaveText('5V0_MAIN');
	await expect(page.getByTestId('rail-revision')).toContainText('r1');
	await expect(page.getByTestId('app-nav')).toContainText('Gateway main board');
	await page.screenshot({ path: 'test-results/nav-design-screen.png' });
	await page.getByTestId('rail-board-link').click();
	await expect(page.getByTestId('board-name')).toHaveText('Gateway main board');

	// A viewer of the same workspace sees the table, and no edit control.
	const viewer = await authenticatedAs('viewer', { workspaceId, owner: page.request });
	await viewer.page.setViewportSize({ width: 1280, height: 900 });
	await viewer.page.goto(`/w/${workspaceId}/projects/${projectId}`);
	const viewerBoard = new BoardPage(viewer.page);
	await expect(viewerBoard.rows()).toHaveCount(2);
	await expect(viewerBoard.row('5V0_MAIN').getByTestId('cell-revision')).toHaveText('r1');
	await expect(viewer.page.getByTestId('nav-user')).toHaveText(viewer.user.name);
	for (const control of ['rail-new', 'rail-edit', 'project-edit', 'project-delete']) {
		await expect(viewer.page.getByTestId(control)).toHaveCount(0);
	}
	await viewer.page.goto(`/w/${workspaceId}`);
	await expect(viewer.page.getByTestId('board-list')).toContainText('Gateway main board');
	await expect(viewer.page.getByTestId('board-form')).toHaveCount(0);
	await expect(viewer.page.getByTestId('invite-form')).toHaveCount(0);
});

test('signed-out visitors are sent to sign in and come back; sign-out ends the session', async ({ page, baseURL }) => {
	await page.goto('/w');
	await expect(page).toHaveURL(/\/sign-in\?redirectTo=%2Fw$/);
	const user = await signUp(page.request, baseURL!, 'Nav Returner');
	await page.goto('/app');
	await expect(page).toHaveURL(/\/w$/);
	await expect(page.getByTestId('nav-user')).toHaveText(user.name);
	await page.getByTestId('sign-out').click();
	await expect(page).toHaveURL(/\/$/);
	await page.goto('/w/anything');
	await expect(page).toHaveURL(/\/sign-in\?redirectTo=/);
});

test('a workspace the caller is not in says so instead of showing an empty page', async ({ authenticatedAs }) => {
	const engineer = await authenticatedAs('engineer');
	await engineer.page.goto('/w/00000000-0000-0000-0000-000000000000');
	await expect(engineer.page.getByTestId('workspace-missing')).toBeVisible();
	await engineer.page.goto(`/w/${engineer.workspaceId}`);
	await expect(engineer.page.getByTestId('board-form')).toBeVisible();
	await expect(engineer.page.getByTestId('invite-form')).toHaveCount(0);
});
