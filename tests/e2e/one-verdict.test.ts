// One verdict per revision: for one saved revision the worst PM, worst GM, highest fc, spread
// yield and pass/caution/fail read the same, character for character, on the design screen,
// the board table, the review page, the sign-off PDF's text (PDF.js) and the API. The text is
// the shared verdictFigures of the verdict the server stored at save.
import type { Locator } from '@playwright/test';
import { expect, originHeaders, test } from './support/fixtures';
import { verdictFigures, verdictLine, type VerdictFigures } from '../../src/lib/verdict/figures';
import type { Verification } from '../../src/lib/engine/verify/types';
import { flat, pdfText } from '../support/pdfText';

const RAIL = { name: 'VDD_1V8', topology: 'buck', vout: 1.8, vinNom: 12, vinMin: 10, vinMax: 14, ioutNom: 3, ioutMin: 1, ioutMax: 4, fsw: 500e3 };
type Shown = Pick<VerdictFigures, 'pm' | 'gm' | 'fc' | 'yield' | 'status'>;

/** The figures a final verdict panel shows. */
async function shownBy(panel: Locator): Promise<Shown> {
	const value = async (id: string) => (await panel.getByTestId(id).textContent())!.trim();
	return {
		pm: await value('verdict-pm-value'),
		gm: await value('verdict-gm-value'),
		fc: await value('verdict-fc-value'),
		yield: await value('verdict-yield-value'),
		status: (await panel.getAttribute('data-status')) as Shown['status']
	};
}
const pick = (f: Shown): Shown => ({ pm: f.pm, gm: f.gm, fc: f.fc, yield: f.yield, status: f.status });

test('the worst PM, GM, fc, yield and verdict of a saved revision read the same on every screen, in the PDF and from the API', async ({ authenticatedAs, baseURL }) => {
	test.setTimeout(120_000);
	const owner = await authenticatedAs('owner');
	const engineer = await authenticatedAs('engineer', { workspaceId: owner.workspaceId, owner: owner.request });
	const headers = originHeaders(baseURL!);
	const project = await (await owner.request.post(`/api/v1/projects?workspace=${owner.workspaceId}`, { headers, data: { name: 'One verdict board' } })).json();
	const rail = await (await owner.request.post(`/api/v1/projects/${project.id}/rails`, { headers, data: RAIL })).json();

	// The design screen: save r1 and read its verdict.
	const page = engineer.page;
	await page.setViewportSize({ width: 1440, height: 1000 });
	await page.goto(`/w/${owner.workspaceId}/projects/${project.id}/rails/${rail.id}`);
	await expect(page.getByTestId('fc-chip')).toBeVisible();
	await page.getByLabel('What changed').fill('First cut');
	await page.getByTestId('save-button').click();
	await expect(page.getByTestId('save-note')).toContainText('Saved as r1', { timeout: 30_000 });
	// The live verdict of the document the screen saved (verifyDesign in the browser), once final.
	const panel = page.locator('[data-testid="verdict"][data-state="final"]');
	await expect(panel).toBeVisible({ timeout: 60_000 });
	const design = await shownBy(panel);

	// The API: the stored verdict, and the report's figures.
	const list = await (await engineer.request.get(`/api/v1/rails/${rail.id}/loops?limit=1`)).json();
	const loopId = list.items[0].id as string;
	const stored = (await (await engineer.request.get(`/api/v1/loops/${loopId}`)).json()).verification as Verification;
	const api = pick(verdictFigures(stored));
	const report = await (await engineer.request.get(`/api/v1/loops/${loopId}/report`)).json();
	expect(pick(report.figures)).toEqual(api);
	expect(design).toEqual(api);

	// The board table.
	await page.goto(`/w/${owner.workspaceId}/projects/${project.id}`);
	const row = page.locator(`[data-testid="rail-row"][data-rail="${RAIL.name}"]`);
	await expect(row.getByTestId('figure-pm')).toBeVisible();
	const board: Shown = {
		pm: (await row.getByTestId('figure-pm').textContent())!.trim(),
		gm: (await row.getByTestId('figure-gm').textContent())!.trim(),
		fc: (await row.getByTestId('figure-fc').textContent())!.trim(),
		yield: (await row.getByTestId('figure-yield').textContent())!.trim(),
		status: (await row.getByTestId('figure-status').getAttribute('data-status')) as Shown['status']
	};
	expect(board).toEqual(api);

	// The review page.
	await page.goto(`/w/${owner.workspaceId}/reviews/${loopId}`);
	await expect(page.getByTestId('stored-verdict')).toBeVisible();
	const review: Shown = {
		pm: (await page.getByTestId('stored-pm').textContent())!.trim(),
		gm: (await page.getByTestId('stored-gm').textContent())!.trim(),
		fc: (await page.getByTestId('stored-fc').textContent())!.trim(),
		yield: (await page.getByTestId('stored-yield').textContent())!.trim(),
		status: (await page.getByTestId('stored-verdict').getAttribute('data-status')) as Shown['status']
	};
	expect(review).toEqual(api);
	// The hover readout and the parts table are there for the reviewer too.
	await page.getByTestId('hover-mag').hover();
	await expect(page.getByTestId('crosshair')).toHaveCount(1);
	await expect(page.getByTestId('hover-readout')).toContainText('Hz');
	await expect(page.getByTestId('review-part').first()).toBeVisible();
	await page.screenshot({ path: 'test-results/one-verdict-review.png', fullPage: true });

	// The PDF, as text.
	const pdf = await engineer.request.get(`/api/v1/loops/${loopId}/exports/pdf`);
	expect(pdf.status()).toBe(200);
	const text = flat((await pdfText(await pdf.body())).text);
	expect(text).toContain(verdictLine({ ...verdictFigures(stored), ...design }));
	expect(text).toContain(`Worst case over ${stored.corners.count} corners: PM ${api.pm} · GM ${api.gm} · fc ${api.fc} · yield ${api.yield} · ${api.status}`);
	expect(text).toContain('Small-signal estimate; confirm margins and transients on hardware');

	// Reopening the rail shows the saved network, not a re-placement: same parts, same verdict.
	await page.goto(`/w/${owner.workspaceId}/projects/${project.id}/rails/${rail.id}`);
	const reopened = page.locator('[data-testid="verdict"][data-state="final"]');
	await expect(reopened).toBeVisible({ timeout: 60_000 });
	const again = await shownBy(reopened);
	expect(again).toEqual(api);
});
