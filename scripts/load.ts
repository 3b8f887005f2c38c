// `npm run test:load`: load, fault and production checks against the production build (node
// build), on 127.0.0.1 only, every run bounded in request count and time. Not part of npm test.
//  1. load: autocannon on POST /api/v1/analyze (1 and 50 clients) and on the rail page's API
//     (rail, latest revisions, one revision); throughput, p50, p99, and the ratio of the API's
//     time per analysis to the engine's own time for the same document (target < 1.5 at 50 clients).
//     Method of the ratio: the API's time is 1 / throughput of the one Node process at 50 clients
//     (a mean over every request, GC included). The engine's time is the mean over 300 calls of
//     analyzeDesign from the same built chunk the server runs, same document and response, JIT
//     warmed, in a fresh Node process (scripts/load-engine.mjs), three times just before and three
//     times just after the 50-client run; the reference is the median of the six. JSON.stringify
//     of the response counts as the API's work (it is reported beside the ratio). The clients keep
//     their session cookies fresh as a browser does (the session cookie cache), and the CPU used by
//     the server and by autocannon in the same run is recorded, so a starved server would show
//     (CPU per answer < wall per answer).
//  2. production checks: sign-in rate limits (better-auth's per address on /api/auth, our
//     per address + account throttle on the form), a 2 MB bench upload, npm audit of production deps
//  3. abuse: a fresh server with the default analysis limits; normal traffic (health, session,
//     the rail page's API, a workspace page) quiet, then again while four users keep eight of the
//     costliest accepted documents in flight (worstCaseDesign); p99 of the normal traffic quiet vs
//     under abuse (target: within 3×), what the abusers were answered, the server's memory (RSS,
//     worker threads included), normal analyses' latency beside it, and that the server stayed up.
//  4. faults: a private MariaDB (own port and data folder) stopped and restarted under a write
//     load: how requests fail while it is down, recovery without an app restart, and every
//     acknowledged write counted in the database afterwards
// Prints the figures and writes them to .tmp/load-records.json. Options: --no-build, --skip-faults,
// --skip-abuse, --only-abuse.
import autocannon from 'autocannon';
import { spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import mysql from 'mysql2/promise';
import { buckDesign, worstCaseDesign } from '../tests/integration/support/designs';
import { ensureMailFake } from '../tests/integration/support/mail-fake';
import { CookieJar, prepareBuild, sh, sleep, startServer as startProductionServer, type Server } from './support/prod-server';
import { confirmationLink } from '../tests/integration/support/mail';

const args = new Set(process.argv.slice(2));
const ROOT = process.cwd();
const SECRET = process.env.BETTER_AUTH_SECRET || randomBytes(32).toString('base64url');
/** The throwaway load users' password, new each run; the wrong one for the rate-limit check. */
const PASSWORD = randomBytes(12).toString('base64url');
const WRONG = PASSWORD + '-not';
const TEST_DB = process.env.DB_NAME_TEST || 'loopwright_test';
const FAULT_DB_PORT = Number(process.env.FAULT_DB_PORT || 3317);
const records: Record<string, unknown> = { date: new Date().toISOString(), node: process.version };
/** What the server uses for its session cookie cache (auth-core.ts: SESSION_CACHE_SECONDS, default 60). */
const SESSION_CACHE_SECONDS = process.env.SESSION_CACHE_SECONDS ? Number(process.env.SESSION_CACHE_SECONDS) : 60;
/** A private copy of the build, so another build in the same checkout cannot swap chunks under the server. */
const BUILD_DIR = '.tmp/load-build';

const log = (...m: unknown[]) => console.log('[load]', ...m);
const round = (x: number, digits = 2) => Number(x.toFixed(digits));

/** The design the load sends: the integration tests' 12 V → 5 V buck, Type III placed by K-factor. */
const DESIGN = buckDesign();

/** `node build` (the private copy) on a free loopback port against the given database, in production mode. */
const startServer = (env: Record<string, string>): Promise<Server> => startProductionServer({ buildDir: BUILD_DIR, secret: SECRET, env });

/** A signed-up user (better-auth's /api/auth) with a workspace, a board, a rail and a saved loop. */
async function signedInTeam(origin: string, label: string) {
	const email = `${label}-${Date.now()}@example.test`;
	const up = await fetch(`${origin}/api/auth/sign-up/email`, { method: 'POST', headers: { origin, 'content-type': 'application/json' }, body: JSON.stringify({ email, password: PASSWORD, name: `Load ${label}` }) });
	if (up.status !== 200) throw new Error(`sign-up failed: ${up.status} ${await up.text()}`);
	// No session before the address is confirmed: open the link the server mailed to the fake.
	const link = await confirmationLink(email);
	const jar = new CookieJar();
	jar.update(await fetch(origin + link.pathname + link.search, { redirect: 'manual' }));
	const cookie = jar.header;
	const call = async (method: string, path: string, body?: unknown) => {
		const r = await fetch(origin + path, { method, headers: { origin, cookie, 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
		const json = await r.json().catch(() => null);
		if (r.status >= 300) throw new Error(`${method} ${path}: ${r.status} ${JSON.stringify(json)}`);
		return json;
	};
	const workspaceId = (await call('POST', '/api/v1/workspaces', { name: `Load ${label}`, slug: `load-${label}-${Date.now()}` })).id as string;
	const projectId = (await call('POST', `/api/v1/projects?workspace=${workspaceId}`, { name: 'Load board' })).id as string;
	const railId = (await call('POST', `/api/v1/projects/${projectId}/rails`, { name: '5V0_LOAD', topology: 'buck', vout: 5, vinNom: 12, vinMin: 9, vinMax: 16, ioutNom: 2, ioutMin: 0.2, ioutMax: 3, fsw: 500_000 })).id as string;
	const loopId = (await call('POST', `/api/v1/rails/${railId}/loops`, { baseRevision: null, design: DESIGN, message: 'load' })).id as string;
	return { origin, cookie, jar, email, workspaceId, projectId, railId, loopId };
}

/**
 * Keeps the jar's session cookies fresh during a run: the server trusts its signed session cookie
 * for SESSION_CACHE_SECONDS and then asks the database and sends a new one; a browser stores it,
 * autocannon does not. A GET /api/v1/me every 2 s (not counted in any figure) picks it up.
 */
function keepFresh(origin: string, jar: CookieJar) {
	const timer = setInterval(() => {
		fetch(`${origin}/api/v1/me`, { headers: { origin, cookie: jar.header } })
			.then(async (r) => (jar.update(r), await r.arrayBuffer()))
			.catch(() => undefined);
	}, 2000);
	return () => clearInterval(timer);
}

/** CPU seconds (user + system) the process `pid` has used, from /proc (Linux). */
function processCpuS(pid: number): number {
	const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
	const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
	const ticks = Number(spawnSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).stdout.trim()) || 100;
	return (Number(fields[11]) + Number(fields[12])) / ticks;
}

function summary(r: autocannon.Result) {
	return {
		requests: r.requests.total,
		durationS: round(r.duration, 1),
		throughputRps: round(r.requests.average, 1),
		p50Ms: r.latency.p50,
		p99Ms: r.latency.p99,
		non2xx: r.non2xx,
		errors: r.errors,
		timeouts: r.timeouts
	};
}

async function cannon(opts: autocannon.Options) {
	return summary(await autocannon({ timeout: 10, ...opts }));
}

interface EngineTime {
	meanMs: number;
	medianMs: number;
	stringifyMs: number;
	responseBytes: number;
}

/** The engine alone on the load's document: the built chunk the server runs, in a fresh process. */
function engineReference(): EngineTime {
	const r = spawnSync(process.execPath, ['scripts/load-engine.mjs', BUILD_DIR, '300'], { input: JSON.stringify(DESIGN), encoding: 'utf8', timeout: 120_000 });
	if (r.status !== 0) throw new Error(`engine reference failed: ${r.stderr}`);
	return JSON.parse(r.stdout.trim().split('\n').pop()!);
}

/** Throughput run with the jar's current cookie on every request; CPU of server and of this process around it. */
async function measuredRun(server: Server, jar: CookieJar, opts: autocannon.Options) {
	const stop = keepFresh(server.origin, jar);
	const setupRequest = (req: autocannon.Request) => ({ ...req, headers: { ...req.headers, cookie: jar.header } });
	const single: autocannon.Request = opts.body === undefined ? { method: opts.method ?? 'GET' } : { method: opts.method ?? 'POST', body: opts.body };
	const requests = (opts.requests ?? [single]).map((r) => ({ ...r, setupRequest }));
	const serverCpu0 = processCpuS(server.child.pid!);
	const ownCpu0 = process.cpuUsage();
	const result = await cannon({ ...opts, requests });
	const ownCpu = process.cpuUsage(ownCpu0);
	const serverCpuS = processCpuS(server.child.pid!) - serverCpu0;
	stop();
	return {
		...result,
		serverCpuMsPerRequest: round((serverCpuS * 1000) / result.requests, 3),
		loadGeneratorCpuMsPerRequest: round((ownCpu.user + ownCpu.system) / 1000 / result.requests, 3)
	};
}

async function loadRuns(server: Server) {
	const team = await signedInTeam(server.origin, 'perf');
	const headers = { origin: server.origin, 'content-type': 'application/json' };
	const body = JSON.stringify(DESIGN);
	const analyze = { url: `${server.origin}/api/v1/analyze`, method: 'POST' as const, headers, body };
	const run = (opts: autocannon.Options) => measuredRun(server, team.jar, opts);
	log('warming up');
	await run({ ...analyze, connections: 4, amount: 300, duration: 20 });
	const engineFirst = engineReference();
	log(`engine alone: ${engineFirst.meanMs.toFixed(3)} ms per analysis (mean), ${engineFirst.medianMs.toFixed(3)} ms (median)`);
	const one = await run({ ...analyze, connections: 1, amount: 400, duration: 30 });
	log('analyze, 1 client', one);
	// What every signed-in request pays before any work: the session lookup (GET /api/v1/me).
	const session = await run({ url: `${server.origin}/api/v1/me`, headers, connections: 1, amount: 400, duration: 30 });
	log('session only (GET /api/v1/me), 1 client', session);
	const session50 = await run({ url: `${server.origin}/api/v1/me`, headers, connections: 50, amount: 3000, duration: 60 });
	log('session only (GET /api/v1/me), 50 clients', session50);
	// The engine's own time just before and just after the 50-client run (the machine may be shared;
	// the two measurements bracket the conditions of the run).
	// Three fresh processes on each side, and their median: one measurement alone was seen 1.9×
	// off its neighbour when something else woke up on the machine.
	const before = [engineReference(), engineReference(), engineReference()];
	const fifty = await run({ ...analyze, connections: 50, amount: 3000, duration: 60 });
	log('analyze, 50 clients', fifty);
	const after = [engineReference(), engineReference(), engineReference()];
	const means = [...before, ...after].map((e) => e.meanMs).sort((a, b) => a - b);
	const engine = (means[2] + means[3]) / 2;
	const engineBefore = before[0];
	const engineAfter = after[2];
	// One Node process answers on one JavaScript thread, so its time per answer is 1/throughput.
	const serverMsPerAnalysis = 1000 / fifty.throughputRps;
	records.analyze = {
		method: 'server: 1 / throughput at 50 clients (mean, GC included); engine: median over 6 fresh processes (3 just before, 3 just after the run) of the mean of 300 analyzeDesign calls from the built chunk, JIT warmed',
		engineMs: round(engine, 3),
		engineMeanMsBefore: before.map((e) => round(e.meanMs, 3)),
		engineMeanMsAfter: after.map((e) => round(e.meanMs, 3)),
		engineMsAtStart: round(engineFirst.meanMs, 3),
		stringifyMs: round((engineBefore.stringifyMs + engineAfter.stringifyMs) / 2, 3),
		responseBytes: engineAfter.responseBytes,
		sessionCacheSeconds: SESSION_CACHE_SECONDS,
		loadAverage: loadavg().map((x) => round(x, 1)),
		oneClient: one,
		fiftyClients: fifty,
		serverMsPerAnalysisAt50: round(serverMsPerAnalysis, 3),
		overheadRatioAt50: round(serverMsPerAnalysis / engine, 2),
		overheadRatioAt50WithoutStringify: round((serverMsPerAnalysis - (engineBefore.stringifyMs + engineAfter.stringifyMs) / 2) / engine, 2),
		latencyRatioOneClient: round(one.p50Ms / engine, 2),
		sessionOnlyOneClient: session,
		sessionOnlyFiftyClients: session50,
		target: 'overheadRatioAt50 < 1.5'
	};
	const rail = [
		{ method: 'GET' as const, path: `/api/v1/rails/${team.railId}` },
		{ method: 'GET' as const, path: `/api/v1/rails/${team.railId}/loops?limit=1` },
		{ method: 'GET' as const, path: `/api/v1/loops/${team.loopId}` }
	];
	const railPage = await run({ url: server.origin, headers, requests: rail, connections: 50, amount: 3000, duration: 60 });
	log('rail page API, 50 clients', railPage);
	records.railPageApi = { requests: rail.map((r) => r.path.replace(/[0-9a-f-]{36}/g, '{id}')), fiftyClients: railPage };
	return team;
}

/** Resident memory of the process `pid` (all its threads), MB, from /proc (Linux). */
function processRssMb(pid: number): number {
	const status = readFileSync(`/proc/${pid}/status`, 'utf8');
	return Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0) / 1024;
}

/** A user with only a session (better-auth allows 3 sign-ups per 10 s per address in production: wait and retry). */
async function signedInUser(origin: string, label: string): Promise<CookieJar> {
	for (let attempt = 0; attempt < 10; attempt++) {
		const email = `${label}-${Date.now()}@example.test`;
		const up = await fetch(`${origin}/api/auth/sign-up/email`, { method: 'POST', headers: { origin, 'content-type': 'application/json' }, body: JSON.stringify({ email, password: PASSWORD, name: `Load ${label}` }) });
		if (up.status === 200) {
			// No session before the address is confirmed: open the link the server mailed to the fake.
			const link = await confirmationLink(email);
			const jar = new CookieJar();
			jar.update(await fetch(origin + link.pathname + link.search, { redirect: 'manual' }));
			return jar;
		}
		if (up.status !== 429) throw new Error(`sign-up failed: ${up.status} ${await up.text()}`);
		await sleep(4000);
	}
	throw new Error('sign-up kept answering 429');
}

const percentile = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] : null);

/**
 * Abuse run: normal traffic quiet and then while the costliest accepted documents keep the analysis
 * pool full. Its own server with the default limits (the load server above allows one user 64
 * analyses in flight so that 50 clients of one user measure throughput).
 */
async function abuseRun() {
	// Sign-up counters live in MariaDB and outlast a run, so the five throwaway users of a second
	// run the same hour would be refused; the analysis limits under test stay at their defaults.
	const server = await startServer({ DB_NAME: TEST_DB, SIGN_UP_LIMIT_PER_HOUR: '1000' });
	try {
		const normal = await signedInTeam(server.origin, 'normal');
		const abusers = [];
		for (let i = 0; i < 4; i++) abusers.push(await signedInUser(server.origin, `abuser${i}`));
		const headers = { origin: server.origin, 'content-type': 'application/json' };
		const traffic: autocannon.Request[] = [
			{ method: 'GET', path: '/api/health' },
			{ method: 'GET', path: '/api/v1/me' },
			{ method: 'GET', path: `/api/v1/rails/${normal.railId}` },
			{ method: 'GET', path: `/api/v1/rails/${normal.railId}/loops?limit=1` },
			{ method: 'GET', path: `/api/v1/loops/${normal.loopId}` },
			{ method: 'GET', path: `/w/${normal.workspaceId}` }
		];
		const normalRun = () => measuredRun(server, normal.jar, { url: server.origin, headers, requests: traffic, connections: 10, amount: 3000, duration: 60 });
		/** Normal analyses one after another (the normal user's small design), latencies in ms. */
		const normalAnalyses = async (until: () => boolean) => {
			const ms: number[] = [];
			const statuses: Record<string, number> = {};
			while (!until()) {
				const t = performance.now();
				const r = await fetch(`${server.origin}/api/v1/analyze`, { method: 'POST', headers: { ...headers, cookie: normal.jar.header }, body: JSON.stringify(DESIGN) });
				await r.arrayBuffer();
				ms.push(performance.now() - t);
				statuses[r.status] = (statuses[r.status] ?? 0) + 1;
			}
			ms.sort((a, b) => a - b);
			return { count: ms.length, p50Ms: round(percentile(ms, 50) ?? 0, 0), maxMs: round(ms.at(-1) ?? 0, 0), statuses };
		};
		const rss: number[] = [];
		const pid = server.child.pid!;
		const sampler = setInterval(() => rss.push(processRssMb(pid)), 250);

		log('abuse: warming up, then normal traffic quiet');
		await normalRun();
		const rssQuiet = processRssMb(pid);
		let quietDone = false;
		const quietAnalyses = normalAnalyses(() => quietDone);
		const quiet = await normalRun();
		quietDone = true;
		const quietAnalysis = await quietAnalyses;
		log('abuse: quiet', quiet, 'normal analyses', quietAnalysis);

		// Four abusers, two lanes each: eight worst-case documents in flight at all times.
		const worst = JSON.stringify(worstCaseDesign());
		let stop = false;
		const answers: Record<string, number> = {};
		const abuseMs: number[] = [];
		const lane = async (jar: CookieJar) => {
			while (!stop) {
				const t = performance.now();
				try {
					const r = await fetch(`${server.origin}/api/v1/analyze`, { method: 'POST', headers: { ...headers, cookie: jar.header }, body: worst });
					await r.arrayBuffer();
					answers[r.status] = (answers[r.status] ?? 0) + 1;
				} catch (error) {
					answers.error = (answers.error ?? 0) + 1;
					if (server.child.exitCode !== null) return;
				}
				abuseMs.push(performance.now() - t);
			}
		};
		const lanes = abusers.flatMap((jar) => [lane(jar), lane(jar)]);
		// Let the pool fill before measuring.
		for (let i = 0; i < 200; i++) {
			const h = (await (await fetch(`${server.origin}/api/health`)).json()) as { analyses: { running: number; waiting: number } };
			if (h.analyses.running > 0 && h.analyses.waiting > 0) break;
			await sleep(100);
		}
		let abusedDone = false;
		const abusedAnalyses = normalAnalyses(() => abusedDone);
		const abused = await normalRun();
		abusedDone = true;
		const abusedAnalysis = await abusedAnalyses;
		const healthDuring = (await (await fetch(`${server.origin}/api/health`)).json()) as Record<string, unknown>;
		stop = true;
		await Promise.all(lanes);
		clearInterval(sampler);
		const alive = server.child.exitCode === null && (await fetch(`${server.origin}/api/health`)).ok;
		abuseMs.sort((a, b) => a - b);
		log('abuse: under abuse', abused, 'normal analyses', abusedAnalysis, 'abusers answered', answers);
		records.abuse = {
			method:
				'normal traffic: autocannon, 10 connections, 3000 requests cycling GET /api/health, /api/v1/me, the rail page API (3 calls) and the workspace page (HTML); once quiet, once while 4 users keep 8 worstCaseDesign() analyses in flight; a fresh server with the default analysis limits; RSS sampled every 250 ms (all threads)',
			worstCaseDocumentBytes: worst.length,
			quiet,
			underAbuse: abused,
			p99Ratio: round(abused.p99Ms / Math.max(1, quiet.p99Ms), 2),
			normalAnalysesQuiet: quietAnalysis,
			normalAnalysesUnderAbuse: abusedAnalysis,
			abuserAnswers: answers,
			abuserLatencyMs: { p50: round(percentile(abuseMs, 50) ?? 0, 0), max: round(abuseMs.at(-1) ?? 0, 0) },
			healthDuringAbuse: healthDuring,
			rssMb: { quiet: round(rssQuiet, 0), peak: round(Math.max(...rss), 0) },
			serverStayedUp: alive,
			loadAverage: loadavg().map((x) => round(x, 1)),
			target: 'p99Ratio ≤ 3, serverStayedUp'
		};
	} finally {
		await server.stop();
	}
}

async function productionChecks(server: Server, team: { jar: CookieJar; railId: string; email: string }) {
	// Sign-in: better-auth limits /sign-in to 3 per 10 s per client address in production.
	const statuses: number[] = [];
	for (let i = 0; i < 5; i++) {
		const r = await fetch(`${server.origin}/api/auth/sign-in/email`, { method: 'POST', headers: { origin: server.origin, 'content-type': 'application/json' }, body: JSON.stringify({ email: team.email, password: WRONG }) });
		statuses.push(r.status);
	}
	// The sign-in form calls better-auth in-process (auth.api), which that limiter does not see; our
	// throttle (sign-in-throttle.ts) answers 429 after 5 wrong passwords per client address + account.
	const form: number[] = [];
	const stranger = `nobody-${Date.now()}@example.test`;
	for (let i = 0; i < 6; i++) {
		const r = await fetch(`${server.origin}/sign-in`, { method: 'POST', redirect: 'manual', headers: { origin: server.origin, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' }, body: new URLSearchParams({ email: stranger, password: WRONG }).toString() });
		form.push(r.status);
		await r.arrayBuffer();
	}
	// A 2 MB analyzer file (19 000 rows with a notes column), inside the documented 5 MB bench limit.
	const pad = 'x'.repeat(60);
	const csv = ['Frequency (Hz),Gain (dB),Phase (deg),Notes', ...Array.from({ length: 19_000 }, (_, i) => `${(10 * 1.0005 ** i).toPrecision(12)},${(40 - i * 1e-3).toFixed(6)},${(-90 - i * 1e-3).toFixed(6)},${pad}`)].join('\n');
	const fd = new FormData();
	fd.set('file', new Blob([csv], { type: 'text/csv' }), 'two-mb.csv');
	const upload = await fetch(`${server.origin}/api/v1/rails/${team.railId}/bench`, { method: 'POST', headers: { origin: server.origin, cookie: team.jar.header }, body: fd });
	const benchStatus = upload.status;
	const benchAnswer = benchStatus >= 300 ? (await upload.text()).slice(0, 300) : undefined;
	records.production = {
		signInApiStatuses: statuses,
		signInFormStatuses: form,
		benchUpload2MbStatus: benchStatus,
		...(benchAnswer ? { benchUpload2MbAnswer: benchAnswer } : {}),
		benchUpload2MbBytes: csv.length
	};
	if (!benchAnswer) await upload.text();
	const audit = spawnSync('npm', ['audit', '--omit=dev', '--json'], { encoding: 'utf8', timeout: 60_000 });
	try {
		const report = JSON.parse(audit.stdout);
		records.npmAudit = report.metadata?.vulnerabilities ?? { unavailable: String(report.message ?? report.error?.summary ?? 'no audit data').slice(0, 160) };
	} catch {
		records.npmAudit = { unavailable: (audit.stderr || 'no output').slice(0, 160) };
	}
	log('production checks', records.production, 'npm audit', records.npmAudit);
}

/** The fault run: private MariaDB, write load, stop and restart it, count the acknowledged writes. */
async function faultRun() {
	const dataDir = `${ROOT}/.data/mariadb-faults-${FAULT_DB_PORT}`;
	const dbEnv = { DB_PORT: String(FAULT_DB_PORT), DB_DATA_DIR: dataDir };
	log(`fault run: private MariaDB on port ${FAULT_DB_PORT}`);
	sh('bash scripts/db-up.sh', dbEnv);
	sh(`npx tsx scripts/migrate.ts ${TEST_DB}`, { ...dbEnv, DB_NAME: TEST_DB });
	const server = await startServer({ ...dbEnv, DB_NAME: TEST_DB });
	try {
		const team = await signedInTeam(server.origin, 'fault');
		const acked: string[] = [];
		const events: { t: number; status: number; ms: number; code: string | null }[] = [];
		const t0 = Date.now();
		let stop = false;
		let n = 0;
		const writer = async () => {
			while (!stop) {
				const started = Date.now();
				let status = 0;
				let code: string | null = null;
				try {
					const r = await fetch(`${server.origin}/api/v1/projects?workspace=${team.workspaceId}`, {
						method: 'POST',
						headers: { origin: server.origin, cookie: team.cookie, 'content-type': 'application/json' },
						body: JSON.stringify({ name: `fault board ${n++}` }),
						signal: AbortSignal.timeout(15_000)
					});
					status = r.status;
					const body = await r.json().catch(() => null);
					code = body?.error?.code ?? null;
					if (status === 201) acked.push(body.id);
				} catch {
					status = -1; // no answer in 15 s, or the connection dropped
				}
				events.push({ t: Date.now() - t0, status, ms: Date.now() - started, code });
				if (status !== 201) await sleep(100);
			}
		};
		const writers = Array.from({ length: 8 }, writer);
		await sleep(3000);
		const downAt = Date.now() - t0;
		sh('bash scripts/db-stop.sh', dbEnv);
		const downDone = Date.now() - t0;
		await sleep(6000);
		const upAt = Date.now() - t0;
		sh('bash scripts/db-up.sh', dbEnv);
		const upDone = Date.now() - t0;
		await sleep(6000);
		stop = true;
		await Promise.all(writers);
		const during = events.filter((e) => e.t - e.ms > downDone && e.t - e.ms < upAt);
		const after = events.filter((e) => e.t - e.ms > upDone);
		const firstOkAfter = after.find((e) => e.status === 201);
		const byStatus = (list: typeof events) => list.reduce<Record<string, number>>((m, e) => ((m[`${e.status}${e.code ? ' ' + e.code : ''}`] = (m[`${e.status}${e.code ? ' ' + e.code : ''}`] ?? 0) + 1), m), {});
		const connection = await mysql.createConnection({ host: '127.0.0.1', port: FAULT_DB_PORT, user: process.env.DB_USER || 'loopwright', password: process.env.DB_PASSWORD || 'loopwright', database: TEST_DB });
		const [rows] = await connection.query("SELECT id FROM project WHERE workspace_id = ? AND name LIKE 'fault board %'", [team.workspaceId]);
		await connection.end();
		const stored = new Set((rows as { id: string }[]).map((r) => r.id));
		const lost = acked.filter((id) => !stored.has(id));
		records.faults = {
			writers: 8,
			requests: events.length,
			acknowledged: acked.length,
			storedAfterwards: stored.size,
			acknowledgedButLost: lost.length,
			whileDown: { answers: byStatus(during), maxMs: Math.max(0, ...during.map((e) => e.ms)), p50Ms: during.map((e) => e.ms).sort((a, b) => a - b)[Math.floor(during.length / 2)] ?? null },
			afterRestart: { answers: byStatus(after), firstSuccessAfterMs: firstOkAfter ? firstOkAfter.t - upDone : null },
			timeline: { stopAtS: downAt / 1000, stoppedAtS: downDone / 1000, restartAtS: upAt / 1000, restartedAtS: upDone / 1000 }
		};
		log('faults', JSON.stringify(records.faults, null, 1));
	} finally {
		await server.stop();
		sh('bash scripts/db-stop.sh', dbEnv);
	}
}

async function main() {
	// The servers mail sign-up confirmations to a fake SMTP server whose folder this process reads.
	const mailer = await ensureMailFake();
	if (mailer) process.on('exit', () => mailer.child.kill('SIGTERM'));
	if (!args.has('--no-build')) log('building');
	prepareBuild(BUILD_DIR, { build: !args.has('--no-build'), env: { BETTER_AUTH_SECRET: SECRET, LOOPWRIGHT_ENV: 'test' } });
	if (args.has('--only-faults')) return faultRun().then(() => console.log(JSON.stringify(records, null, 2)));
	sh('bash scripts/db-up.sh');
	sh(`npx tsx scripts/migrate.ts ${TEST_DB}`, { DB_NAME: TEST_DB });
	if (!args.has('--only-abuse')) {
		// One user drives 50 clients here (throughput of the process, not fairness): the per-user
		// analysis limit is raised for this server only; the abuse run uses the defaults.
		const server = await startServer({ DB_NAME: TEST_DB, ANALYSIS_PER_USER: '64', ANALYSIS_QUEUE: '64' });
		try {
			const team = await loadRuns(server);
			await productionChecks(server, team);
		} finally {
			await server.stop();
		}
	}
	if (!args.has('--skip-abuse')) await abuseRun();
	if (!args.has('--skip-faults') && !args.has('--only-abuse')) await faultRun();
	mkdirSync('.tmp', { recursive: true });
	writeFileSync('.tmp/load-records.json', JSON.stringify(records, null, 2));
	log('records written to .tmp/load-records.json');
	console.log(JSON.stringify(records, null, 2));
	const a = records.analyze as { overheadRatioAt50: number } | undefined;
	const ab = records.abuse as { p99Ratio: number; serverStayedUp: boolean } | undefined;
	const f = records.faults as { acknowledgedButLost: number; whileDown: { answers: Record<string, number> }; afterRestart: { firstSuccessAfterMs: number | null } } | undefined;
	const not503 = f ? Object.keys(f.whileDown.answers).filter((k) => !/^(201|503)/.test(k)) : [];
	const failed = [
		a && a.overheadRatioAt50 >= 1.5 && 'analyze overhead at 50 clients is 1.5× or more',
		ab && ab.p99Ratio > 3 && 'normal traffic p99 under abuse is more than 3× its quiet value',
		ab && !ab.serverStayedUp && 'the server went down under abuse',
		f && f.acknowledgedButLost > 0 && 'acknowledged writes were lost',
		not503.length > 0 && `answers other than 503 while the database was down: ${not503.join(', ')}`,
		f && f.afterRestart.firstSuccessAfterMs === null && 'no write succeeded after the database came back'
	].filter(Boolean);
	if (failed.length) {
		console.error('[load] FAILED:', failed.join('; '));
		process.exitCode = 1;
	}
}

main().catch((error) => {
	console.error(error);
	process.exit(1);
});
