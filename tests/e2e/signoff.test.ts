// Sign-off in the browser: an engineer saves a loop and asks a reviewer; the reviewer sees the
// e-mail on /dev/mail (their own mail only), the reviewer finds the loop in the review queue and approves it, and the
// sign-off PDF downloads. A bench file uploads on the rail screen and overlays the plot, and
// every export downloads with the right kind of content.
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { createConnection } from 'node:net';
import { expect, originHeaders, test, type SignedIn } from './support/fixtures';

let fake: ChildProcess | null = null;
const smtpPort = Number(process.env.SMTP_PORT || 2525);

function listening(port: number): Promise<boolean> {
	return new Promise((resolve) => {
		const s = createConnection({ host: '127.0.0.1', port });
		s.once('connect', () => (s.destroy(), resolve(true)));
		s.once('error', () => resolve(false));
	});
}

// The server mails through SMTP_PORT; when no fake listens there (a bare playwright run), start
// one with the same environment, so it writes where /dev/mail reads.
test.beforeAll(async () => {
	if (await listening(smtpPort)) return;
	fake = spawn(process.execPath, ['--import', 'tsx', 'scripts/mail-fake.ts'], { env: { ...process.env, SMTP_PORT: String(smtpPort) }, stdio: 'ignore' });
	for (let i = 0; i < 80 && !(await listening(smtpPort)); i++) await new Promise((r) => setTimeout(r, 100));
});
test.afterAll(() => {
	fake?.kill('SIGTERM');
});

const RAIL = { topology: 'buck', vout: 1.8, vinNom: 12, vinMin: 10, vinMax: 14, ioutNom: 3, ioutMin: 1, ioutMax: 4, fsw: 500e3 };

async function boardWithRail(owner: SignedIn, baseURL: string, name: string) {
	const headers = originHeaders(baseURL);
	const project = await (await owner.request.post(`/api/v1/projects?workspace=${owner.workspaceId}`, { headers, data: { name: `Board ${name}` } })).json();
	const res = await owner.request.post(`/api/v1/projects/${project.id}/rails`, { headers, data: { ...RAIL, name } });
	expect(res.status(), await res.text()).toBe(201);
	const rail = await res.json();
	return { projectId: project.id as string, railId: rail.id as string, url: `/w/${owner.workspaceId}/projects/${project.id}/rails/${rail.id}` };
}

test('an engineer requests a review, the reviewer approves it from the queue and the PDF downloads', async ({ authenticatedAs, baseURL }) => {
	const owner = await authenticatedAs('owner');
	const into = { workspaceId: owner.workspaceId, owner: owner.request };
	const engineer = await authenticatedAs('engineer', into);
	const reviewer = await authenticatedAs('reviewer', into);
	const { url } = await boardWithRail(owner, baseURL!, 'VDD_1V8');

	const page = engineer.page;
	await page.setViewportSize({ width: 1440, height: 1000 });
	await page.goto(url);
	await expect(page.getByTestId('fc-chip')).toBeVisible();
	await page.getByLabel('What changed').fill('First cut for sign-off');
	await page.getByTestId('save-button').click();
	// The server verifies every corner and the spread before it answers; slow on a shared 2-core machine.
	await expect(page.getByTestId('save-note')).toContainText('Saved as r1', { timeout: 30_000 });
	await page.getByRole('checkbox', { name: /E2E Reviewer/ }).check();
	await page.getByLabel('Note for the reviewers (optional)').fill('Please check Vin max');
	await page.getByTestId('request-review').click();
	await expect(page.getByTestId('review-note')).toContainText('Review requested; 1 e-mail sent');
	await expect(page.getByTestId('rail-revision')).toContainText('r1 · in review'); // words, not the status code
	await page.screenshot({ path: 'test-results/signoff-rail.png', fullPage: true });

	// The reviewer reads their own captured mail on the development mail page; the owner sees none of it.
	await reviewer.page.goto('/dev/mail');
	await expect(reviewer.page.getByText('Sign-off requested: VDD_1V8 r1').first()).toBeVisible();
	await owner.page.goto('/dev/mail');
	await expect(owner.page.getByRole('heading', { name: 'Captured mail' })).toBeVisible();
	await expect(owner.page.getByText('Sign-off requested: VDD_1V8 r1')).toHaveCount(0);

	// The reviewer finds it in the queue and opens the review.
	const rp = reviewer.page;
	await rp.setViewportSize({ width: 1440, height: 1100 });
	await rp.goto(`/w/${owner.workspaceId}/reviews`);
	const row = rp.locator('[data-testid="queue-row"][data-rail="VDD_1V8"]');
	await expect(row).toContainText('waiting for you');
	await row.getByRole('link', { name: 'VDD_1V8 r1' }).click();
	await expect(rp.getByTestId('review-title')).toHaveText('VDD_1V8 r1');
	// The verdict stored at save, the worst corners, the parts and the step, as the engineer saw them.
	await expect(rp.getByTestId('stored-verdict')).toBeVisible();
	await expect(rp.getByTestId('stored-yield')).toHaveText(/%$/);
	expect(await rp.getByTestId('margin-row').count()).toBeGreaterThan(3);
	await expect(rp.getByTestId('review-part').first()).toBeVisible();
	await expect(rp.getByTestId('load-step')).toContainText('peak');
	await expect(rp.getByTestId('review-plot').getByTestId('bode-plot')).toBeVisible();
	await rp.getByLabel('Comment', { exact: true }).fill('Phase dips near the crossover');
	await rp.getByLabel('Pin to frequency (optional)').fill('40k');
	await rp.getByTestId('comment-submit').click();
	await expect(rp.getByTestId('comment-freq')).toHaveText('at 40 kHz');
	// The pinned comment is drawn on the plot at its frequency.
	await expect(rp.getByTestId('plot-pin')).toHaveAttribute('data-freq', '40000');
	await rp.screenshot({ path: 'test-results/signoff-review.png', fullPage: true });
	await rp.getByTestId('approve').click();
	await expect(rp.getByTestId('review-status')).toHaveText('approved');
	await expect(rp.getByTestId('locked-note')).toBeVisible();

	const [download] = await Promise.all([rp.waitForEvent('download'), rp.getByTestId('review-export-pdf').click()]);
	expect(download.suggestedFilename()).toBe('VDD_1V8-r1-signoff.pdf');
	const pdf = readFileSync((await download.path())!);
	expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');

	// The author sees the decision on the rail screen.
	await page.reload();
	await expect(page.getByTestId('rail-revision')).toContainText('r1 · approved');
});

test('a bench file uploads and overlays the plot, and every export downloads', async ({ authenticatedAs, baseURL }) => {
	const owner = await authenticatedAs('owner');
	const engineer = await authenticatedAs('engineer', { workspaceId: owner.workspaceId, owner: owner.request });
	const { url } = await boardWithRail(owner, baseURL!, 'VCORE_0V9');
	const page = engineer.page;
	await page.setViewportSize({ width: 1440, height: 1000 });
	await page.goto(url);
	await page.getByLabel('What changed').fill('Starter');
	await page.getByTestId('save-button').click();
	await expect(page.getByTestId('save-note')).toContainText('Saved as r1');

	const expected: Record<string, (b: Buffer) => boolean> = {
		csv: (b) => b.toString('utf8').startsWith('Frequency (Hz),Loop gain (dB)'),
		svg: (b) => b.toString('utf8').startsWith('<svg'),
		png: (b) => b.subarray(1, 4).toString('latin1') === 'PNG',
		spice: (b) => /\.end\s*$/.test(b.toString('utf8')),
		json: (b) => JSON.parse(b.toString('utf8')).schemaVersion === 1,
		pdf: (b) => b.subarray(0, 5).toString('latin1') === '%PDF-'
	};
	const files: Record<string, Buffer> = {};
	for (const format of Object.keys(expected)) {
		const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId(`export-${format}`).click()]);
		files[format] = readFileSync((await d.path())!);
		expect(expected[format](files[format]), `${format} content`).toBe(true);
	}

	// The exported sweep, uploaded back as bench data, overlays the model.
	await page.getByTestId('bench-file').setInputFiles({ name: 'bench.csv', mimeType: 'text/csv', buffer: files.csv });
	await page.getByLabel('Vin (V)').fill('12');
	await page.getByLabel('Instrument').fill('FRA bench 2');
	await page.getByTestId('bench-upload').click();
	await expect(page.getByTestId('bench-note')).toContainText('bench.csv: 400 points read.');
	await expect(page.getByTestId('bench-metrics')).toContainText('Measured: fc');
	await expect(page.getByTestId('bench-deviation')).toContainText('|Δ| ≤ 0.00 dB');
	expect(await page.getByTestId('measured-mag').locator('circle').count()).toBeGreaterThan(300);
	// The plot's legend names the bench series (the dots had no key; fails on the old legend).
	await expect(page.getByTestId('legend-measured').first()).toContainText('(measured)');

	// A broken file names its line and column.
	await page.getByTestId('bench-file').setInputFiles({ name: 'broken.csv', mimeType: 'text/csv', buffer: Buffer.from('Frequency (Hz),Gain (dB),Phase (deg)\n100,40,-90\n1000,x,-100\n') });
	await page.getByTestId('bench-upload').click();
	await expect(page.getByTestId('bench-note')).toContainText('line 3, column 2');
	await page.screenshot({ path: 'test-results/signoff-bench.png', fullPage: true });

	// Its network saved as a template, previewed on the same rail from the templates page.
	await page.getByLabel('Template name').fill('Ceramic buck, K-factor');
	await page.getByTestId('save-template').click();
	await expect(page.getByText('Saved as template “Ceramic buck, K-factor”.')).toBeVisible();
	await page.goto(`/w/${owner.workspaceId}/templates?q=ceramic`);
	const card = page.locator('[data-testid="template-card"][data-template="Ceramic buck, K-factor"]');
	// The starter's fc: fsw/10 held within 5·f0 of its LC resonance.
	await expect(card).toContainText('Type III · k-factor · fc = fsw × 0.092');
	await card.getByTestId('apply-rail').selectOption({ label: 'Board VCORE_0V9 / VCORE_0V9' });
	await card.getByTestId('apply-preview').click();
	await expect(card.getByTestId('apply-result')).toContainText('On VCORE_0V9: fc');
	await page.screenshot({ path: 'test-results/signoff-templates.png', fullPage: true });
});
