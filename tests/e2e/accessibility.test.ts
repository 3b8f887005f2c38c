// The automated accessibility check: axe-core (through @axe-core/playwright) on every main page,
// in the paper and the dark theme, against the WCAG 2.1 A and AA rules. The bar is zero
// violations of serious or critical impact; each failure lists the rule, its impact, the
// elements and axe's own summary, so the fix can start from the message.
import AxeBuilder from '@axe-core/playwright';
import type { Page } from '@playwright/test';
import { buckDesign } from '../integration/support/designs';
import { expect, originHeaders, test } from './support/fixtures';

const THEMES = ['light', 'dark'] as const;
const WCAG_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

async function seriousViolations(page: Page) {
	const result = await new AxeBuilder({ page }).withTags(WCAG_TAGS).analyze();
	return result.violations
		.filter((v) => v.impact === 'serious' || v.impact === 'critical')
		.map((v) => ({
			rule: v.id,
			impact: v.impact,
			help: v.help,
			nodes: v.nodes.slice(0, 5).map((n) => `${n.target.join(' ')} — ${n.failureSummary?.split('\n').slice(1, 2).join(' ').trim()}`)
		}));
}

/**
 * Opens `path` in each theme (saved the way the theme switch saves it) and records its serious
 * and critical violations under `found`; `ready` waits for the page's data. Each test asserts
 * `found` is empty at its end, so one run names every page's problems.
 */
async function check(found: Record<string, unknown>, page: Page, name: string, path: string, ready: (page: Page) => Promise<void>) {
	for (const theme of THEMES) {
		await page.addInitScript((t) => localStorage.setItem('loopwright-theme', t), theme);
		await page.goto(path);
		await ready(page);
		await expect(page.locator('html')).toHaveAttribute('data-theme', theme);
		const violations = await seriousViolations(page);
		if (violations.length) found[`${name} (${path}), ${theme}`] = violations;
	}
}

test('public pages: landing, sign-in, sign-up', async ({ page }) => {
	await page.setViewportSize({ width: 1280, height: 800 });
	const found: Record<string, unknown> = {};
	await check(found, page, 'landing', '/', (p) => expect(p.locator('main')).toBeVisible());
	await check(found, page, 'sign-in', '/sign-in', (p) => expect(p.getByRole('button', { name: /sign in/i })).toBeVisible());
	await check(found, page, 'sign-up', '/sign-up', (p) => expect(p.getByRole('button', { name: /create|sign up/i })).toBeVisible());
	expect(found).toEqual({});
});

type AuthenticatedAs = Parameters<Parameters<typeof test>[2]>[0]['authenticatedAs'];

/** An owner and a reviewer of one workspace with a board, a rail, a loop waiting for the reviewer and a template, plus a second workspace of the owner's (so /w is the home with its lists, not a redirect). */
async function team(authenticatedAs: AuthenticatedAs, baseURL: string) {
	const owner = await authenticatedAs('owner');
	const reviewer = await authenticatedAs('reviewer', { workspaceId: owner.workspaceId, owner: owner.request });
	const headers = originHeaders(baseURL);
	const ws = owner.workspaceId;
	const project = await (await owner.request.post(`/api/v1/projects?workspace=${ws}`, { headers, data: { name: 'Axe board' } })).json();
	const rail = await (
		await owner.request.post(`/api/v1/projects/${project.id}/rails`, {
			headers,
			data: { name: '5V0_MAIN', topology: 'buck', vout: 5, vinNom: 12, vinMin: 9, vinMax: 16, ioutNom: 2, ioutMin: 0.2, ioutMax: 3, fsw: 500_000 }
		})
	).json();
	const loop = await (await owner.request.post(`/api/v1/rails/${rail.id}/loops`, { headers, data: { baseRevision: null, design: buckDesign(), message: 'first cut' } })).json();
	const me = await (await reviewer.request.get('/api/v1/me')).json();
	const asked = await owner.request.post(`/api/v1/loops/${loop.id}/review`, { headers, data: { action: 'request-review', reviewerIds: [me.user.id] } });
	expect(asked.status(), await asked.text()).toBe(200);
	await owner.request.post(`/api/v1/templates?workspace=${ws}`, { headers, data: { name: 'Axe template', compensator: { kind: 'type3', target: { method: 'k-factor', crossoverHz: 40000, phaseMarginDeg: 60 } } } });
	await owner.request.post('/api/v1/workspaces', { headers, data: { name: 'Axe second', slug: `axe-${Date.now().toString(36)}` } });
	await owner.page.setViewportSize({ width: 1280, height: 800 });
	await reviewer.page.setViewportSize({ width: 1280, height: 800 });
	return { owner, reviewer, ws, projectId: project.id as string, railId: rail.id as string, loopId: loop.id as string };
}

test('signed-in pages: home, workspace, board, rail design screen', async ({ authenticatedAs, baseURL }) => {
	test.setTimeout(300_000);
	const { owner, ws, projectId, railId } = await team(authenticatedAs, baseURL!);
	const page = owner.page;
	const found: Record<string, unknown> = {};
	await check(found, page, 'home', '/w', (p) => expect(p.getByTestId('home-panels')).toBeVisible());
	await check(found, page, 'workspace', `/w/${ws}`, (p) => expect(p.getByTestId('member-table')).toBeVisible());
	await check(found, page, 'board', `/w/${ws}/projects/${projectId}`, (p) => expect(p.getByTestId('health-table')).toBeVisible());
	await check(found, page, 'design screen', `/w/${ws}/projects/${projectId}/rails/${railId}`, (p) => expect(p.locator('svg').first()).toBeVisible());
	expect(found).toEqual({});
});

test('signed-in pages: review queue, review page, templates, administration, settings', async ({ authenticatedAs, baseURL }) => {
	test.setTimeout(300_000);
	const { owner, reviewer, ws, loopId } = await team(authenticatedAs, baseURL!);
	const page = owner.page;
	const found: Record<string, unknown> = {};
	await check(found, page, 'review queue', `/w/${ws}/reviews`, (p) => expect(p.locator('main')).toContainText('5V0_MAIN'));
	await check(found, page, 'review page', `/w/${ws}/reviews/${loopId}`, (p) => expect(p.locator('main')).toContainText('5V0_MAIN'));
	await check(found, page, 'templates', `/w/${ws}/templates`, (p) => expect(p.locator('main')).toContainText('Axe template'));
	await check(found, page, 'administration', `/w/${ws}/admin`, (p) => expect(p.getByTestId('admin-member-table')).toBeVisible());
	await check(found, page, 'settings', '/settings', (p) => expect(p.getByTestId('settings-token-table-empty')).toBeVisible());
	// The reviewer's home lists the sign-off asked of them.
	await check(found, reviewer.page, 'home of a reviewer', `/w/${ws}`, (p) => expect(p.getByTestId('home-reviews')).toContainText('5V0_MAIN'));
	expect(found).toEqual({});
});
