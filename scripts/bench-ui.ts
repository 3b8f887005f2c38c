// `npm run bench:ui`: what a person waits for on the design screen, board, review page and exports, measured in Debian's
// Chromium (Playwright, headless, 1440×900) against the production build on its own port and a
// fresh database (`loopwright_bench`, demo seed and the 200-rail "Scale test" workspace of
// `scripts/seed.ts --scale`). A benchmark, never a test: it prints p50/p95 per
// interaction beside its budget and the ratio p95/budget, with the machine's load average, and
// writes .tmp/bench-ui.json (the summary and every sample, in the order taken). Options:
// --no-build (reuse build/), --samples N (keystrokes and drag steps per screen, default 40),
// --rounds N (tab cycles, board→rail clicks; default 10), --only a,b (sections: sandbox, rails, board, server, scale; default all; the 200-rail workspace
// is seeded only when the scale section runs), --reuse-db (keep the bench database of an earlier
// run instead of a fresh one: faster while iterating, never for the figures you publish),
// --plain-marker (time the paint with a plain MessageChannel task, as before, instead of the
// scheduler's 'user-blocking' one: shows what the browser's own tasks queued behind a frame add).
//
// Method (in the page, installed before any page script runs):
//  - The input is real: Playwright sends it through CDP (Input.dispatchKeyEvent / MouseEvent), so
//    the page sees ordinary trusted events. A capture-phase listener on window records, for the
//    first event of the armed type, its `event.timeStamp` (when the browser created the event,
//    same clock as performance.now()) and performance.now() at dispatch into the page.
//  - A MutationObserver on the region that must change (the Bode plot's magnitude panel for a
//    keystroke or a drag step, the design screen for a tab, the document for board → rail) waits
//    for the first DOM change after the event after which the ready condition holds (for a tab:
//    its panel's content is there and visible, not merely a placeholder).
//  - "Painted" is the end of the rendering update that carries that change: if the change was
//    made inside a requestAnimationFrame callback, that same frame renders it, so a task posted
//    then runs right after the frame's style, layout and paint (at the scheduler's 'user-blocking'
//    priority, ahead of the browser's own queued tasks: after a keystroke Chromium's autofill task,
//    TASK_TYPE_INTERNAL_AUTOFILL in a trace, about 10 ms, ran between the frame's commit and a plain
//    MessageChannel task and was counted as the page's paint time); otherwise the next
//    animation frame renders it, so the task is posted from a requestAnimationFrame callback.
//    performance.now() in that task is the paint time. (Event Timing's PerformanceObserver 'event'
//    entries would give the same for a handler that paints at once, but not for work an app
//    schedules later, such as a debounce, and they round durations to 8 ms.)
//  - Keystroke, tab switch and board → rail: event.timeStamp → painted. Pointer moves are
//    dispatched by Chromium aligned to the next animation frame, so waiting for that frame is
//    not the page's work: a drag step is measured from dispatch into the page → painted (the
//    frame's work, budget one 16.7 ms frame); event.timeStamp → painted is printed beside it.
//  - Beside each design-screen row: the renderer main thread's CPU time from just before the
//    input to just after the paint (CDP Performance.getMetrics ThreadTime, read outside the timed
//    span; it includes the two short page calls that arm and read the probe). On a loaded machine
//    the wall time waits for a core; this is what the page itself spent, the figure a quiet machine
//    approaches. And the screen's own per-frame log (engine, DOM update) for keystrokes and drags.
//  - Server rows (review page first byte, PNG and PDF exports) are timed from Node with the
//    browser's session cookie: first byte = the first chunk of the body; exports = whole body.
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from '@playwright/test';
import { randomBytes } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { ensureMailFake } from '../tests/integration/support/mail-fake';
import { prepareBuild, sh, sleep, startServer, type Server } from './support/prod-server';
import { DEMO_EMAIL, DEMO_PASSWORD } from './demo-users';

const argv = process.argv.slice(2);
const flag = (name: string) => argv.includes(name);
const option = (name: string, fallback: number) => {
	const i = argv.indexOf(name);
	return i >= 0 ? Number(argv[i + 1]) : fallback;
};
const SAMPLES = option('--samples', 40);
const ROUNDS = option('--rounds', 10);
const onlyAt = argv.indexOf('--only');
const ONLY = onlyAt >= 0 ? new Set(argv[onlyAt + 1].split(',')) : null;
const section = (name: 'sandbox' | 'rails' | 'board' | 'server' | 'scale') => !ONLY || ONLY.has(name);
const DB = 'loopwright_bench';
const BUILD_DIR = '.tmp/bench-ui-build';
/** The auth secret of this run's private server, new each run (no secret literal in the source). */
const SECRET = process.env.BETTER_AUTH_SECRET || randomBytes(32).toString('base64url');
const VIEWPORT = { width: 1440, height: 900 };
const log = (...m: unknown[]) => console.log('[bench:ui]', ...m);

/** Budgets, ms [common practice: one 60 Hz frame for a drag step, two for a keystroke; 100 ms feels instant for a tab, 500 ms for a page or a file; 150 ms to a page's first byte]. */
const FRAME = 1000 / 60;
const BUDGET = { drag: FRAME, keystroke: 2 * FRAME, tab: 100, boardToRail: 500, reviewFirstByte: 150, exportFile: 500 };

interface Row {
	name: string;
	samples: number[];
	budgetMs: number;
	note?: string;
	/** Printed beside the row, not compared with the budget. */
	extra?: { label: string; samples: number[] };
	/** The renderer main thread's CPU time over each sample (CDP ThreadTime): what the page itself spent, whatever else the machine runs. */
	cpu?: number[];
	/** The design screen's own log of its frame work (engine, DOM update), ms per frame. */
	frames?: { computeMs: number[]; updateMs: number[] };
}
const rows: Row[] = [];
const skipped: { name: string; why: string }[] = [];

// ---------------------------------------------------------------------------------------------
// In-page instrumentation.

interface Sample {
	eventTs: number;
	dispatchTs: number;
	paintTs: number;
}
interface BenchApi {
	arm(o: { root: string; ready?: string; event: string }): void;
	result(timeoutMs: number): Promise<Sample | null>;
}

/** Runs in the page before its own scripts (see the header for the method). */
function instrument() {
	const raf = window.requestAnimationFrame.bind(window);
	let inFrame = false;
	// The marker task runs at the scheduler's highest priority where the browser has one
	// (scheduler.postTask 'user-blocking'), so that tasks of the browser's own queued before it (after a
	// keystroke, Chromium's autofill looks at the form for about 10 ms) do not count as the frame's time.
	const sched = (window as unknown as { scheduler?: { postTask?: (fn: () => void, o: { priority: string }) => Promise<void> } }).scheduler;
	const postTask = (fn: () => void) => {
		if (sched?.postTask && !(window as unknown as { __benchPlainMarker?: boolean }).__benchPlainMarker) {
			void sched.postTask(fn, { priority: 'user-blocking' });
			return;
		}
		const ch = new MessageChannel();
		ch.port1.onmessage = () => fn();
		ch.port2.postMessage(0);
	};
	// Marks the rendering task: true from the first animation-frame callback of a frame until a
	// task posted then runs, which is after that frame's style, layout and paint.
	window.requestAnimationFrame = (cb: FrameRequestCallback) =>
		raf((ts) => {
			if (!inFrame) {
				inFrame = true;
				postTask(() => (inFrame = false));
			}
			cb(ts);
		});
	const afterPaint = () =>
		new Promise<number>((resolve) => {
			const done = () => postTask(() => resolve(performance.now()));
			if (inFrame) done();
			else raf(() => done());
		});
	let armed: { event: string; eventTs: number | null; dispatchTs: number; observer: MutationObserver | null; promise: Promise<Sample> } | null = null;
	const api: BenchApi = {
		arm({ root, ready, event }) {
			let resolve!: (s: Sample) => void;
			const promise = new Promise<Sample>((r) => (resolve = r));
			const state = { event, eventTs: null as number | null, dispatchTs: 0, observer: null as MutationObserver | null, promise };
			armed = state;
			const isReady = () => {
				if (!ready) return true;
				const el = document.querySelector(ready);
				return !!el && el.checkVisibility();
			};
			const target = document.querySelector(root) ?? document.body;
			const observer = new MutationObserver(() => {
				if (state.eventTs === null || !isReady()) return;
				observer.disconnect();
				afterPaint().then((paintTs) => resolve({ eventTs: state.eventTs!, dispatchTs: state.dispatchTs, paintTs }));
			});
			state.observer = observer;
			observer.observe(target, { subtree: true, childList: true, attributes: true, characterData: true });
		},
		result(timeoutMs) {
			const a = armed;
			if (!a) return Promise.resolve(null);
			return Promise.race([a.promise, new Promise<null>((r) => setTimeout(() => (a.observer?.disconnect(), r(null)), timeoutMs))]);
		}
	};
	for (const type of ['keydown', 'pointermove', 'click']) {
		window.addEventListener(
			type,
			(e) => {
				if (armed && armed.event === type && armed.eventTs === null) {
					armed.eventTs = e.timeStamp;
					armed.dispatchTs = performance.now();
				}
			},
			{ capture: true }
		);
	}
	(window as unknown as { __bench: BenchApi }).__bench = api;
}

/** The renderer main thread's CPU time so far, ms (CDP Performance.getMetrics ThreadTime). */
const cdpSessions = new WeakMap<Page, CDPSession>();
async function threadTimeMs(page: Page): Promise<number> {
	let cdp = cdpSessions.get(page);
	if (!cdp) {
		cdp = await page.context().newCDPSession(page);
		await cdp.send('Performance.enable');
		cdpSessions.set(page, cdp);
	}
	const { metrics } = await cdp.send('Performance.getMetrics');
	return (metrics.find((m) => m.name === 'ThreadTime')?.value ?? NaN) * 1000;
}

/** The design screen's frame log (DesignScreen's __loopwrightFrames) of one kind, emptied after reading. */
async function takeFrames(page: Page, kind: 'input' | 'drag'): Promise<{ computeMs: number[]; updateMs: number[] }> {
	const frames = await page.evaluate((k) => {
		const log = (window as unknown as { __loopwrightFrames?: { kind?: string; computeMs: number; updateMs: number }[] }).__loopwrightFrames ?? [];
		const mine = log.filter((f) => f.kind === k);
		log.length = 0;
		return mine;
	}, kind);
	return { computeMs: frames.map((f) => f.computeMs), updateMs: frames.map((f) => f.updateMs) };
}

async function arm(page: Page, o: { root: string; ready?: string; event: string }) {
	await page.evaluate((opts) => (window as unknown as { __bench: BenchApi }).__bench.arm(opts), o);
}
async function result(page: Page, timeoutMs = 10_000): Promise<Sample | null> {
	return page.evaluate((t) => (window as unknown as { __bench: BenchApi }).__bench.result(t), timeoutMs);
}

// ---------------------------------------------------------------------------------------------
// Statistics and output.

function percentile(values: number[], p: number): number {
	if (values.length === 0) return NaN;
	const sorted = [...values].sort((a, b) => a - b);
	return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}
const ms = (x: number) => (Number.isFinite(x) ? x.toFixed(1) : '–');

function printTable(load: { start: number[]; end: number[] }) {
	const header = ['interaction', 'n', 'p50 ms', 'p95 ms', 'budget ms', 'p95/budget'];
	const lines = rows.map((r) => {
		const p95 = percentile(r.samples, 95);
		return [r.name, String(r.samples.length), ms(percentile(r.samples, 50)), ms(p95), ms(r.budgetMs), Number.isFinite(p95) ? (p95 / r.budgetMs).toFixed(2) : '–'];
	});
	const widths = header.map((h, i) => Math.max(h.length, ...lines.map((l) => l[i].length)));
	const fmt = (cells: string[]) => '| ' + cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join(' | ') + ' |';
	console.log('');
	console.log(fmt(header));
	console.log('| ' + widths.map((w, i) => (i === 0 ? '-'.repeat(w) : '-'.repeat(w - 1) + ':')).join(' | ') + ' |');
	for (const l of lines) console.log(fmt(l));
	console.log('');
	for (const r of rows) {
		if (r.note) console.log(`  ${r.name}: ${r.note}`);
		if (r.extra) console.log(`  ${r.name}: ${r.extra.label} p50 ${ms(percentile(r.extra.samples, 50))} ms, p95 ${ms(percentile(r.extra.samples, 95))} ms`);
		if (r.cpu?.length) console.log(`  ${r.name}: renderer main-thread CPU from the input to the paint p50 ${ms(percentile(r.cpu, 50))} ms, p95 ${ms(percentile(r.cpu, 95))} ms`);
		if (r.frames?.computeMs.length)
			console.log(`  ${r.name}: in the page, per frame: engine p50 ${ms(percentile(r.frames.computeMs, 50))} ms (p95 ${ms(percentile(r.frames.computeMs, 95))}), DOM update p50 ${ms(percentile(r.frames.updateMs, 50))} ms (p95 ${ms(percentile(r.frames.updateMs, 95))}); style, layout and paint follow`);
	}
	for (const s of skipped) console.log(`  skipped: ${s.name}: ${s.why}`);
	const la = (v: number[]) => v.map((x) => x.toFixed(2)).join(' ');
	console.log(`  load average (1, 5, 15 min): ${la(load.start)} at the start, ${la(load.end)} at the end; ${cpus().length} CPUs`);
	console.log(`  paint marker: ${flag('--plain-marker') ? 'a plain MessageChannel task (--plain-marker)' : "a scheduler.postTask 'user-blocking' task"} after the frame`);
	const over = rows.filter((r) => percentile(r.samples, 95) > r.budgetMs);
	console.log(over.length ? `  over budget: ${over.map((r) => r.name).join('; ')}` : '  every row within its budget');
}

// ---------------------------------------------------------------------------------------------
// Interactions.

/** The plot's magnitude panel: what a keystroke or a drag step must repaint. */
// Scoped to the Loop tab's panel: the Corners panel, once opened, keeps a Bode plot of its own.
const PLOT_ROOT = '[data-testid="design-screen"] #panel-loop [data-testid="mag-panel"]';
const LOOP_TRACE = '[data-testid="design-screen"] #panel-loop [data-testid="mag-panel"] path[data-trace^="loop:"]';

async function openDesign(page: Page, url: string) {
	await page.goto(url);
	await page.locator(LOOP_TRACE).first().waitFor({ state: 'visible', timeout: 30_000 });
	await settle(page);
}

/** Lets the screen finish what an input started (deferred sections, the verdict worker). */
async function settle(page: Page) {
	await page.waitForFunction(() => !document.querySelector('[data-testid="verdict"][data-state="updating"]'), undefined, { timeout: 30_000 }).catch(() => undefined);
	await sleep(600);
}

/** Keystrokes in the inductor field: the first digit selected and retyped, alternating between two values. */
async function keystrokes(page: Page, name: string) {
	const field = page.locator('[data-testid="design-screen"] [data-testid="field-l"]');
	const original = await field.inputValue();
	const first = original[0];
	const other = first === '1' ? '2' : '1';
	const samples: number[] = [];
	const cpu: number[] = [];
	let missed = 0;
	await takeFrames(page, 'input');
	for (let i = 0; i < SAMPLES; i++) {
		await field.focus();
		await page.keyboard.press('Home');
		await page.keyboard.press('Shift+ArrowRight');
		await arm(page, { root: PLOT_ROOT, event: 'keydown' });
		const cpu0 = await threadTimeMs(page);
		await page.keyboard.press(i % 2 === 0 ? other : first);
		const s = await result(page, 5000);
		const cpu1 = await threadTimeMs(page);
		if (s) {
			samples.push(s.paintTs - s.eventTs);
			cpu.push(cpu1 - cpu0);
		} else missed++;
		// A person typing: about four keystrokes a second.
		await sleep(250);
	}
	await settle(page);
	rows.push({ name: `keystroke → plot repainted (${name})`, samples, budgetMs: BUDGET.keystroke, note: missed ? `${missed} keystrokes repainted nothing within 5 s` : undefined, cpu, frames: await takeFrames(page, 'input') });
}

/** Drags the first draggable marker back and forth in small steps, one step per painted frame. */
async function drag(page: Page, name: string) {
	const marker = page.locator('[data-testid="design-screen"] [data-testid="root-lane"] [role="slider"]').first();
	const box = await marker.boundingBox();
	if (!box) throw new Error('no draggable marker on the plot');
	const y = box.y + box.height / 2;
	const x0 = box.x + box.width / 2;
	await page.mouse.move(x0, y);
	await page.mouse.down();
	const fromDispatch: number[] = [];
	const fromEvent: number[] = [];
	const cpu: number[] = [];
	let missed = 0;
	await takeFrames(page, 'drag');
	for (let i = 0; i < SAMPLES; i++) {
		// A few pixels either side of the start, never twice the same place in a row and never far
		// enough to pass a neighbouring corner (which would only show a note, not a new plot).
		const dx = (i % 2 === 0 ? 1 : -1) * (2 + (i % 5));
		await arm(page, { root: PLOT_ROOT, event: 'pointermove' });
		const cpu0 = await threadTimeMs(page);
		await page.mouse.move(x0 + dx, y);
		const s = await result(page, 5000);
		const cpu1 = await threadTimeMs(page);
		if (s) {
			fromDispatch.push(s.paintTs - s.dispatchTs);
			fromEvent.push(s.paintTs - s.eventTs);
			cpu.push(cpu1 - cpu0);
		} else missed++;
	}
	const frames = await takeFrames(page, 'drag');
	await page.mouse.move(x0, y);
	await page.mouse.up();
	await settle(page);
	rows.push({
		name: `drag step → painted frame (${name})`,
		samples: fromDispatch,
		budgetMs: BUDGET.drag,
		note: missed ? `${missed} moves painted nothing within 5 s` : undefined,
		extra: { label: 'from event.timeStamp (includes the wait for the next frame)', samples: fromEvent },
		cpu,
		frames
	});
}

/** What shows that a panel's content (not a placeholder) is on screen. */
const TAB_READY: Record<string, string> = {
	closed: '[data-testid="closed-loop-panel"] [data-testid="plot-zout"] path',
	step: '[data-testid="step-panel"] [data-testid="load-peak"]',
	corners: '[data-testid="corner-table"]',
	spread: '[data-testid="spread-panel"]',
	filter: '[data-testid="filter-panel"]',
	loop: LOOP_TRACE
};

async function tabSwitches(page: Page, name: string) {
	const order = ['closed', 'step', 'corners', 'spread', 'filter', 'loop'];
	const samples = new Map<string, number[]>(order.map((t) => [t, []]));
	const missed = new Map<string, number>();
	const cpu = new Map<string, number[]>(order.map((t) => [t, []]));
	for (let round = 0; round < ROUNDS; round++) {
		for (const tab of order) {
			await arm(page, { root: '[data-testid="design-screen"]', ready: TAB_READY[tab], event: 'click' });
			const cpu0 = await threadTimeMs(page);
			await page.getByTestId(`tab-${tab}`).click();
			const s = await result(page, 10_000);
			const cpu1 = await threadTimeMs(page);
			if (s) {
				samples.get(tab)!.push(s.paintTs - s.eventTs);
				cpu.get(tab)!.push(cpu1 - cpu0);
			} else missed.set(tab, (missed.get(tab) ?? 0) + 1);
			await sleep(150);
		}
	}
	for (const tab of order) {
		rows.push({ name: `tab switch → ${tab} painted (${name})`, samples: samples.get(tab)!, budgetMs: BUDGET.tab, note: missed.get(tab) ? `${missed.get(tab)} switches showed no content within 10 s` : undefined, cpu: cpu.get(tab) });
	}
}

/** Board page → click a rail → the rail's plot painted (client-side navigation, same document). */
async function boardToRail(page: Page, boardUrl: string, name: string) {
	const samples: number[] = [];
	let missed = 0;
	for (let round = 0; round < ROUNDS; round++) {
		await page.goto(boardUrl);
		const links = page.getByTestId('rail-link');
		await links.first().waitFor({ state: 'visible', timeout: 30_000 });
		const count = await links.count();
		await sleep(300);
		await arm(page, { root: 'body', ready: LOOP_TRACE, event: 'click' });
		await links.nth((round * 7) % count).click();
		const s = await result(page, 15_000);
		if (s) samples.push(s.paintTs - s.eventTs);
		else missed++;
	}
	rows.push({ name: `board → rail, plot painted (${name})`, samples, budgetMs: BUDGET.boardToRail, note: missed ? `${missed} clicks showed no plot within 15 s` : undefined });
}

async function cookieHeader(context: BrowserContext) {
	return (await context.cookies()).map((c) => `${c.name}=${c.value}`).join('; ');
}

/** Requests answered 429 and tried again, per URL: printed, since a waiting client is what a person sees. */
const busyRetries = new Map<string, number>();

/**
 * Time to the first chunk of the body (first byte), or to the whole body. A 429 (this user's
 * analyses in flight: the review page keeps drawing after its first byte) is waited out as a
 * client would, honouring retry-after, and the attempt that answers is the one timed.
 */
async function timeRequest(url: string, cookie: string, whole: boolean): Promise<number> {
	let t0 = performance.now();
	let res = await fetch(url, { headers: { cookie } });
	for (let retry = 1; res.status === 429 && retry <= 20; retry++) {
		await res.body?.cancel();
		busyRetries.set(url, (busyRetries.get(url) ?? 0) + 1);
		await sleep(Math.max(250, Number(res.headers.get('retry-after') ?? 0) * 1000));
		t0 = performance.now();
		res = await fetch(url, { headers: { cookie } });
	}
	if (!res.ok) throw new Error(`${url}: HTTP ${res.status}`);
	const reader = res.body!.getReader();
	const first = await reader.read();
	const tFirst = performance.now();
	if (!whole) {
		await reader.cancel();
		return tFirst - t0;
	}
	let done = first.done;
	while (!done) done = (await reader.read()).done;
	return performance.now() - t0;
}

async function serverRow(name: string, url: string, cookie: string, whole: boolean, budgetMs: number, n = 20) {
	await timeRequest(url, cookie, whole); // warm-up (first compile of the route's code)
	const samples: number[] = [];
	for (let i = 0; i < n; i++) samples.push(await timeRequest(url, cookie, whole));
	const retries = busyRetries.get(url);
	rows.push({ name, samples, budgetMs, note: retries ? `${retries} answers were 429 (analyses of this user in flight) and were tried again; each sample times the attempt that answered` : undefined });
}

// ---------------------------------------------------------------------------------------------
// Data: the seeded workspaces through the API, with the browser's session.

interface Ids {
	workspaceId: string;
	boards: { id: string; name: string }[];
	rails: { id: string; name: string; projectId: string; topology: string }[];
}

async function api(page: Page, path: string) {
	const res = await page.request.get(path);
	if (!res.ok()) throw new Error(`GET ${path}: ${res.status()} ${await res.text()}`);
	return res.json();
}

async function workspaceIds(page: Page, name: string): Promise<Ids | null> {
	const me = await api(page, '/api/v1/me');
	const ws = (me.workspaces as { id: string; name: string }[]).find((w) => w.name === name);
	if (!ws) return null;
	const projects = await api(page, `/api/v1/projects?workspace=${ws.id}`);
	const boards = ((projects.items ?? projects) as { id: string; name: string }[]).map((p) => ({ id: p.id, name: p.name }));
	const rails: Ids['rails'] = [];
	for (const b of boards.slice(0, 2)) {
		const list = await api(page, `/api/v1/projects/${b.id}/rails`);
		for (const r of (list.items ?? list) as { id: string; name: string; topology: string }[]) rails.push({ id: r.id, name: r.name, projectId: b.id, topology: r.topology });
	}
	return { workspaceId: ws.id, boards, rails };
}

async function latestLoopId(page: Page, railId: string): Promise<string | null> {
	const list = await api(page, `/api/v1/rails/${railId}/loops?limit=1`);
	return list.items?.[0]?.id ?? null;
}

// ---------------------------------------------------------------------------------------------

function prepareDatabase(reuse: boolean) {
	sh('bash scripts/db-up.sh');
	// A fresh database of its own, so the figures never depend on what earlier runs left behind
	// (unless --reuse-db asks to keep it: migrations and both seeds are idempotent).
	const drop = reuse ? '' : `DROP DATABASE IF EXISTS \\\`${DB}\\\`; `;
	sh(
		`source scripts/env.sh && "$(command -v mariadb || echo /usr/bin/mariadb)" --no-defaults --protocol=socket --socket="$DB_SOCKET" -uroot -e "${drop}CREATE DATABASE IF NOT EXISTS \\\`${DB}\\\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci; GRANT ALL PRIVILEGES ON \\\`${DB}\\\`.* TO '$DB_USER'@'127.0.0.1', '$DB_USER'@'localhost';"`
	);
	sh(`npx tsx scripts/migrate.ts ${DB}`, { DB_NAME: DB });
	sh('npx tsx scripts/seed.ts', { DB_NAME: DB });
}

async function main() {
	const load = { start: loadavg(), end: [] as number[] };
	log(`load average at the start: ${load.start.map((x) => x.toFixed(2)).join(' ')}`);
	// Debian's Chromium, installed as `npm test` installs it when a fresh machine lacks it.
	if (!process.env.CHROMIUM_PATH) sh('source scripts/env.sh && source scripts/deps.sh && ensure_debian_package chromium chromium');
	const mailer = await ensureMailFake();
	if (mailer) process.on('exit', () => mailer.child.kill('SIGTERM'));
	if (!flag('--no-build')) log('building');
	prepareBuild(BUILD_DIR, { build: !flag('--no-build'), env: { BETTER_AUTH_SECRET: SECRET } });
	prepareDatabase(flag('--reuse-db'));
	if (section('scale')) {
		log('seeding the 200-rail "Scale test" workspace');
		sh('npx tsx scripts/seed.ts --scale', { DB_NAME: DB });
	}

	let server: Server | null = null;
	let browser: Browser | null = null;
	try {
		server = await startServer({ buildDir: BUILD_DIR, secret: SECRET, env: { DB_NAME: DB } });
		log(`server at ${server.origin}`);
		browser = await chromium.launch({
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync']
		});
		const context = await browser.newContext({ viewport: VIEWPORT, baseURL: server.origin });
		// tsx compiles with esbuild's keepNames, whose `__name` helper the page lacks.
		await context.addInitScript({ content: `var __name = (f) => f;${flag('--plain-marker') ? ' window.__benchPlainMarker = true;' : ''} (${instrument.toString()})();` });
		const page = await context.newPage();

		if (section('sandbox')) {
			log('sandbox');
			await openDesign(page, '/try');
			await keystrokes(page, 'sandbox');
			await drag(page, 'sandbox');
			await tabSwitches(page, 'sandbox');
		}

		log('signing in as the demo owner');
		await page.goto('/sign-in');
		await page.getByLabel('E-mail').fill(DEMO_EMAIL);
		await page.getByLabel('Password').fill(DEMO_PASSWORD);
		await page.getByRole('button', { name: 'Sign in' }).click();
		await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 30_000 });

		const demo = await workspaceIds(page, 'Kestrel Fieldworks');
		if (!demo) throw new Error('the demo workspace is missing');
		const railUrl = (r: Ids['rails'][number]) => `/w/${demo.workspaceId}/projects/${r.projectId}/rails/${r.id}`;
		const buck = demo.rails.find((r) => r.name === '5V0_MAIN') ?? demo.rails.find((r) => r.topology === 'buck')!;
		const boost = demo.rails.find((r) => r.name === '5V0_SENSOR') ?? demo.rails.find((r) => r.topology === 'boost')!;
		for (const [rail, label] of section('rails')
			? ([
					[buck, `buck rail ${buck.name}`],
					[boost, `boost rail ${boost.name}`]
				] as const)
			: []) {
			log(label);
			await openDesign(page, railUrl(rail));
			await keystrokes(page, label);
			await drag(page, label);
			if (rail === buck) await tabSwitches(page, label);
		}

		if (section('board')) {
			log('board → rail');
			await boardToRail(page, `/w/${demo.workspaceId}/projects/${demo.boards[0].id}`, 'demo board');
		}

		const cookie = await cookieHeader(context);
		// The loop waiting for review in the demo (1V0_CORE), else the buck rail's latest.
		const core = demo.rails.find((r) => r.name === '1V0_CORE');
		const reviewLoop = (core && (await latestLoopId(page, core.id))) ?? (await latestLoopId(page, buck.id));
		if (!reviewLoop) throw new Error('no loop revision to review');
		if (section('server')) log('review page and exports');
		if (section('server')) await serverRow('review page, server first byte (demo)', `${server.origin}/w/${demo.workspaceId}/reviews/${reviewLoop}`, cookie, false, BUDGET.reviewFirstByte);
		if (section('server')) await serverRow('PNG export (demo)', `${server.origin}/api/v1/loops/${reviewLoop}/exports/png`, cookie, true, BUDGET.exportFile, 10);
		if (section('server')) await serverRow('PDF export (demo)', `${server.origin}/api/v1/loops/${reviewLoop}/exports/pdf`, cookie, true, BUDGET.exportFile, 10);

		const big = section('scale') ? await workspaceIds(page, 'Scale test') : null;
		if (!section('scale')) {
			// not asked for
		} else if (!big) {
			skipped.push({ name: 'Scale test rows', why: 'seed.ts --scale ran but no workspace named "Scale test" is visible to the demo owner' });
		} else {
			log('Scale test workspace');
			const board = big.boards[0];
			await boardToRail(page, `/w/${big.workspaceId}/projects/${board.id}`, 'Scale test, 200 rails');
			const loop = await latestLoopId(page, big.rails[Math.floor(big.rails.length / 2)].id);
			if (loop) await serverRow('review page, server first byte (Scale test)', `${server.origin}/w/${big.workspaceId}/reviews/${loop}`, cookie, false, BUDGET.reviewFirstByte);
		}
	} finally {
		await browser?.close();
		await server?.stop();
	}
	load.end = loadavg();
	printTable(load);
	mkdirSync('.tmp', { recursive: true });
	const summary = rows.map((r) => ({ name: r.name, n: r.samples.length, p50Ms: percentile(r.samples, 50), p95Ms: percentile(r.samples, 95), budgetMs: r.budgetMs, ratio: percentile(r.samples, 95) / r.budgetMs, note: r.note ?? null, mainThreadCpuP50Ms: r.cpu?.length ? percentile(r.cpu, 50) : null, mainThreadCpuP95Ms: r.cpu?.length ? percentile(r.cpu, 95) : null, samplesMs: r.samples, cpuMs: r.cpu ?? null, frames: r.frames ?? null }));
	writeFileSync('.tmp/bench-ui.json', JSON.stringify({ date: new Date().toISOString(), loadavg: load, cpus: cpus().length, rows: summary, skipped }, null, 2));
	log('figures written to .tmp/bench-ui.json');
	// The mail fake is a child process: while it runs, this process would never end.
	mailer?.child.kill('SIGTERM');
}

main().catch((error) => {
	console.error(error);
	process.exit(1);
});
