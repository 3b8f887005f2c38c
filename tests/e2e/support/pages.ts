// Page objects for the signed-in pages: the workspaces home, a workspace, and a board's
// health table. They name elements by role, label and test id, as a user would find them.
import { expect, type Locator, type Page } from '@playwright/test';

export class WorkspacesHome {
	constructor(readonly page: Page) {}
	async open() {
		await this.page.goto('/w');
		await expect(this.page.getByRole('heading', { name: 'Your workspaces' })).toBeVisible();
	}
	async create(name: string, slug: string) {
		await this.page.getByLabel('Name', { exact: true }).fill(name);
		await this.page.getByLabel('Short name (slug)').fill(slug);
		await this.page.getByTestId('workspace-create').click();
	}
}

export class WorkspaceHome {
	constructor(readonly page: Page) {}
	async addBoard(name: string, description = '') {
		await this.page.getByLabel('New board').fill(name);
		if (description) await this.page.getByLabel('Description (optional)').fill(description);
		await this.page.getByTestId('board-create').click();
	}
}

export type RailValues = Partial<Record<'name' | 'vout' | 'vinMin' | 'vinNom' | 'vinMax' | 'ioutMin' | 'ioutNom' | 'ioutMax' | 'fsw', string>> & {
	topology?: 'buck' | 'boost';
};

export class BoardPage {
	readonly table: Locator;
	readonly form: Locator;
	constructor(readonly page: Page) {
		this.table = page.getByTestId('health-table');
		this.form = page.getByTestId('rail-form');
	}
	async openNewRail() {
		await this.page.getByTestId('rail-new').click();
		await expect(this.form).toBeVisible();
	}
	/** Types the given values into the open rail form (engineering notation as text). */
	async fillRail(values: RailValues) {
		if (values.topology) await this.form.getByTestId('field-topology').selectOption(values.topology);
		for (const [key, value] of Object.entries(values)) {
			if (key !== 'topology' && value !== undefined) await this.form.getByTestId(`field-${key}`).fill(value);
		}
	}
	async saveRail() {
		await this.form.getByTestId('rail-save').click();
	}
	fieldError(key: string): Locator {
		return this.form.getByTestId(`error-${key}`);
	}
	rows(): Locator {
		return this.table.getByTestId('rail-row');
	}
	row(name: string): Locator {
		return this.table.locator(`[data-testid="rail-row"][data-rail="${name}"]`);
	}
	async railNames(): Promise<string[]> {
		return this.rows().evaluateAll((rows) => rows.map((r) => r.getAttribute('data-rail') ?? ''));
	}
	async sortBy(column: string) {
		await this.table.getByTestId(`sort-${column}`).click();
	}
}
