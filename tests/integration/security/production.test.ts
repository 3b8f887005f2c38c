// What production would do, checked on the app's own better-auth configuration in a child
// process with NODE_ENV=production (better-auth reads it once, at import; the dev server of
// these tests runs with NODE_ENV=test, where it neither rate-limits nor checks origins):
// no secret or the public development default is refused; sign-in answers 429 after a burst
// of wrong passwords from one client while another client is unaffected, and a client cannot
// choose its address with X-Forwarded-For (the per-account throttle: sign-in-limits.test.ts).
// Also: no secret is written into the source, and production dependencies have no high or
// critical advisory.
import '../support/env';
import { execFile } from 'node:child_process';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { servedApp } from '../support/app';

const run = promisify(execFile);
const app = servedApp();
const SCRIPT = 'tests/integration/security/support/production-auth.ts';
const DEV_SECRET = 'loopwright-development-secret-not-for-production-use';

async function inProduction(mode: string, env: Record<string, string | undefined>) {
	const childEnv: Record<string, string> = {};
	for (const [k, v] of Object.entries({ ...process.env, NODE_ENV: 'production', LOOPWRIGHT_ENV: 'production', ORIGIN: app.origin, ...env })) {
		if (v !== undefined) childEnv[k] = v;
	}
	const { stdout } = await run(process.execPath, ['--import', 'tsx', SCRIPT, mode], { env: childEnv, timeout: 60_000 });
	return JSON.parse(stdout.trim().split('\n').pop()!);
}

describe('production settings', () => {
	it('refuses to start without BETTER_AUTH_SECRET or with the development default', async () => {
		const outcome = await inProduction('secret', { BETTER_AUTH_SECRET: undefined });
		expect(outcome.unset).toMatch(/^refused: BETTER_AUTH_SECRET must be set/);
		expect(outcome.development).toMatch(/^refused: .*development default/);
		expect(outcome.real).toBe('started');
	});

	it('rate-limits sign-in per client: the 4th wrong password within 10 s is 429, another client is unaffected', async () => {
		// better-auth's default rule for /sign-in: 3 requests per 10 s per client [published: better-auth docs, rate limit].
		const r = await inProduction('burst', { BETTER_AUTH_SECRET: 'a-real-secret-from-the-environment-0123456789' });
		expect(r.sameClient).toEqual([401, 401, 401, 429, 429]);
		expect(r.otherClient).toEqual([401, 401]);
		// The address is only the one the request hook writes: a client's own X-Forwarded-For is ignored.
		expect(r.rotatingForwardedFor).toEqual([401, 401, 401, 429]);
	});
});

describe('secrets only from the environment', () => {
	const files: string[] = [];
	const walk = (dir: string) => {
		for (const name of readdirSync(dir)) {
			const full = join(dir, name);
			if (statSync(full).isDirectory()) walk(full);
			else if (/\.(ts|js|svelte|mjs|sh)$/.test(name)) files.push(full);
		}
	};
	walk('src');
	walk('scripts');

	it('no key, password or token literal is written into the source', () => {
		const suspicious = [
			/-----BEGIN [A-Z ]*PRIVATE KEY-----/,
			/\b(?:sk|pk|rk)_(?:live|test)_[0-9a-zA-Z]{16,}/,
			/\bAKIA[0-9A-Z]{16}\b/,
			/\bgh[pousr]_[0-9A-Za-z]{30,}/,
			/\blw_[A-Za-z0-9_-]{40,}/,
			/(?:secret|password|passwd|api[_-]?key|token)["']?\s*[:=]\s*["'][^"'\s]{16,}["']/i
		];
		// Named development defaults, refused in production (checked above), local-only demo data, and the
		// password of the checkout's private database (read from the environment first).
		const allowed = [DEV_SECRET, 'loopwright-demo', 'test-secret-for-local-runs-only', '${DB_PASSWORD:-loopwright}'];
		const hits: string[] = [];
		for (const file of files) {
			readFileSync(file, 'utf8')
				.split('\n')
				.forEach((line, i) => {
					if (suspicious.some((re) => re.test(line)) && !allowed.some((a) => line.includes(a))) hits.push(`${file}:${i + 1}: ${line.trim().slice(0, 120)}`);
				});
		}
		expect(hits).toEqual([]);
	});

	it('the server reads its secret and database password from process.env', () => {
		const authCore = readFileSync('src/lib/server/auth-core.ts', 'utf8');
		expect(authCore).toMatch(/process\.env\.BETTER_AUTH_SECRET/);
		expect(readFileSync('src/lib/server/env.ts', 'utf8')).toMatch(/DB_PASSWORD/);
	});
});

describe('npm audit of production dependencies', () => {
	it('has no high or critical advisory (skipped with a note when the registry has no audit service)', async (ctx) => {
		let report: { metadata?: { vulnerabilities?: Record<string, number> } };
		try {
			const { stdout } = await run('npm', ['audit', '--omit=dev', '--json'], { timeout: 60_000 }).catch((e) => e as { stdout: string });
			report = JSON.parse(stdout);
		} catch (error) {
			ctx.skip(`npm audit gave no report: ${(error as Error).message.slice(0, 200)}`);
			return;
		}
		const counts = report.metadata?.vulnerabilities;
		if (!counts) {
			ctx.skip(`the registry answered no audit data (${JSON.stringify(report).slice(0, 200)}); run npm audit --omit=dev where the audit service is reachable`);
			return;
		}
		expect({ high: counts.high ?? 0, critical: counts.critical ?? 0 }).toEqual({ high: 0, critical: 0 });
	}, 90_000);
});
