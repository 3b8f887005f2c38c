// Page-load figures against a running server (production build), as the
// demo owner on the seeded data (npx tsx scripts/seed.ts --scale first):
//   review page first byte, board table complete (all rows with their verdict), board → rail
//   click to plot visible (Debian's Chromium), PNG and PDF export of a revision with a stored verdict
//   (kept files after the warm-up) and the first PNG / PDF of a revision saved just before (each
//   run saves one more revision of the measured rail).
// Prints median and p95 per row with the load average. A measurement, not a test: no budgets asserted.
// Run: npx tsx scripts/measure-pages.ts [origin] [runs]   (origin default http://127.0.0.1:$PORT)
import { loadavg } from 'node:os';
import { chromium } from '@playwright/test';
import { DEMO_EMAIL, DEMO_PASSWORD } from './demo-users';

const origin = process.argv[2] ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`;
const runs = Number(process.argv[3] ?? 9);

let cookie = '';
async function get(path: string, accept = 'application/json') {
	const started = performance.now();
	const response = await fetch(origin + path, { headers: { cookie, accept, origin } });
	const firstByte = performance.now() - started;
	const body = Buffer.from(await response.arrayBuffer());
	if (!response.ok) throw new Error(`${path}: HTTP ${response.status} ${body.toString().slice(0, 200)}`);
	return { firstByte, total: performance.now() - started, body };
}
const json = async <T>(path: string) => JSON.parse((await get(path)).body.toString()) as T;

function stats(xs: number[]) {
	const s = [...xs].sort((a, b) => a - b);
	const at = (q: number) => s[Math.min(s.length - 1, Math.ceil(q * s.length) - 1)];
	return { p50: at(0.5), p95: at(0.95) };
}
const rows: { what: string; p50: number; p95: number; load: number }[] = [];
async function measure(what: string, once: () => Promise<number>) {
	await once(); // warm-up: first compile of the route, caches
	const xs: number[] = [];
	for (let i = 0; i < runs; i++) xs.push(await once());
	const row = { what, ...stats(xs), load: loadavg()[0] };
	rows.push(row);
	console.log(`${what.padEnd(58)} p50 ${row.p50.toFixed(0).padStart(5)} ms  p95 ${row.p95.toFixed(0).padStart(5)} ms  (load ${row.load.toFixed(2)})`);
}

async function main() {
	const signIn = await fetch(origin + '/api/auth/sign-in/email', {
		method: 'POST',
		headers: { 'content-type': 'application/json', origin },
		body: JSON.stringify({ email: DEMO_EMAIL, password: DEMO_PASSWORD })
	});
	if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status}`);
	cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');

	type Ws = { id: string; name: string };
	const me = await json<{ workspaces: Ws[] }>('/api/v1/me');
	const scale = me.workspaces.find((w) => w.name === 'Scale test');
	const demo = me.workspaces.find((w) => w.name === 'Kestrel Fieldworks');
	if (!scale || !demo) throw new Error('seed first: npx tsx scripts/seed.ts --scale');
	for (const ws of [demo, scale]) {
		const boards = await json<{ items: { id: string; name: string; railCount: number }[] }>(`/api/v1/projects?workspace=${ws.id}&limit=200`);
		const board = [...boards.items].sort((a, b) => b.railCount - a.railCount)[0];
		const rails = await json<{ items: { id: string; name: string }[] }>(`/api/v1/projects/${board.id}/rails?limit=200`);
		const rail = rails.items[0];
		const loops = await json<{ items: { id: string; status: string }[] }>(`/api/v1/rails/${rail.id}/loops?limit=1`);
		const loop = loops.items[0];
		const tag = `${ws.name}, ${board.railCount} rails`;
		await measure(`review page first byte (${tag})`, async () => (await get(`/w/${ws.id}/reviews/${loop.id}`, 'text/html')).firstByte);
		await measure(`PNG export (${tag})`, async () => (await get(`/api/v1/loops/${loop.id}/exports/png`, 'image/png')).total);
		await measure(`PDF export (${tag})`, async () => (await get(`/api/v1/loops/${loop.id}/exports/pdf`, 'application/pdf')).total);

		// A revision saved just now: the first download of each file, as a person clicks it right after the save.
		const firstAfterSave = async (format: 'png' | 'pdf') => {
			const design = (await json<{ design: unknown }>(`/api/v1/loops/${loop.id}`)).design;
			const latest = (await json<{ items: { revision: number }[] }>(`/api/v1/rails/${rail.id}/loops?limit=1`)).items[0].revision;
			const saved = await fetch(`${origin}/api/v1/rails/${rail.id}/loops`, {
				method: 'POST',
				headers: { cookie, origin, 'content-type': 'application/json' },
				body: JSON.stringify({ baseRevision: latest, design, message: `measure-pages: first ${format}` })
			});
			if (saved.status !== 201) throw new Error(`save: HTTP ${saved.status}`);
			const id = ((await saved.json()) as { id: string }).id;
			return (await get(`/api/v1/loops/${id}/exports/${format}${format === 'png' ? '?corners=1' : ''}`, format === 'png' ? 'image/png' : 'application/pdf')).total;
		};
		await measure(`first PNG right after a save (${tag})`, () => firstAfterSave('png'));
		await measure(`first PDF right after a save (${tag})`, () => firstAfterSave('pdf'));

		const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: ['--no-sandbox', '--disable-gpu'] });
		const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
		const host = new URL(origin).hostname;
		await context.addCookies(cookie.split('; ').map((c) => ({ name: c.slice(0, c.indexOf('=')), value: c.slice(c.indexOf('=') + 1), domain: host, path: '/' })));
		const page = await context.newPage();
		const boardUrl = `${origin}/w/${ws.id}/projects/${board.id}`;
		// Complete: every row drawn and none still waiting for its verdict.
		const complete = async () =>
			page.waitForFunction(
				(n) => document.querySelectorAll('[data-testid=rail-row]').length === n && !document.body.textContent!.includes('loading the verdict'),
				board.railCount,
				{ timeout: 60_000, polling: 'raf' }
			);
		await measure(`board table complete, navigation start (${tag})`, async () => {
			const t = performance.now();
			await page.goto(boardUrl, { waitUntil: 'commit' });
			await complete();
			return performance.now() - t;
		});
		await measure(`board → rail, click to plot visible (${tag})`, async () => {
			await page.goto(boardUrl);
			await complete();
			const t = performance.now();
			await page.getByTestId('rail-link').first().click();
			await page.locator('[data-testid=mag-panel] path').first().waitFor({ state: 'visible', timeout: 60_000 });
			return performance.now() - t;
		});
		await browser.close();
	}
}

try {
	await main();
} catch (e) {
	console.error(e);
	process.exitCode = 1;
}
