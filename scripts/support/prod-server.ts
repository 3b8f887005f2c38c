// The production build as the load run and the UI benchmark start it: a private copy of
// `build/` (so another build in the same checkout cannot swap chunks under a running server),
// `node <copy>` on a free loopback port in production mode, and a cookie jar that follows
// Set-Cookie answers as a browser does. Used by scripts/load.ts and scripts/bench-ui.ts.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { freePort } from '../../tests/integration/support/mail-fake';

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Runs a shell command with the given extra environment; throws when it fails. */
export function sh(command: string, env: Record<string, string> = {}) {
	const r = spawnSync('bash', ['-c', command], { stdio: 'inherit', env: { ...process.env, ...env } });
	if (r.status !== 0) throw new Error(`failed (${r.status}): ${command}`);
}

/** `vite build` (unless `build` is false), then a private copy of build/ at `dir`. */
export function prepareBuild(dir: string, opts: { build: boolean; env?: Record<string, string> }) {
	if (opts.build) sh('npx vite build --logLevel warn', opts.env ?? {});
	sh(`rm -rf ${dir} && mkdir -p "$(dirname ${dir})" && cp -r build ${dir}`);
}

export interface Server {
	origin: string;
	child: ChildProcess;
	stop(): Promise<void>;
}

/** Server log lines that are expected noise of a run (failed sign-ins on purpose, etc.). */
const QUIET = /Rate limiting could not determine|User not found|Invalid password/;

/** `node <buildDir>` on a free loopback port against the database in `env`, in production mode. */
export async function startServer(opts: { buildDir: string; secret: string; env: Record<string, string> }): Promise<Server> {
	const port = await freePort();
	const origin = `http://127.0.0.1:${port}`;
	const child = spawn(process.execPath, [opts.buildDir], {
		env: { ...process.env, NODE_ENV: 'production', LOOPWRIGHT_ENV: 'production', HOST: '127.0.0.1', PORT: String(port), ORIGIN: origin, BETTER_AUTH_URL: origin, BETTER_AUTH_SECRET: opts.secret, BODY_SIZE_LIMIT: '7M', ...opts.env },
		stdio: ['ignore', 'ignore', 'pipe']
	});
	child.stderr!.on('data', (d: Buffer) => {
		const text = d.toString();
		if (!QUIET.test(text)) process.stderr.write(`[server] ${text}`);
	});
	for (let i = 0; i < 100; i++) {
		try {
			if ((await fetch(`${origin}/api/health`)).ok) break;
		} catch {
			/* not listening yet */
		}
		await sleep(200);
	}
	return {
		origin,
		child,
		stop: () =>
			new Promise<void>((resolve) => {
				if (child.exitCode !== null) return resolve();
				const kill = setTimeout(() => child.kill('SIGKILL'), 10_000);
				child.once('exit', () => (clearTimeout(kill), resolve()));
				child.kill('SIGTERM');
			})
	};
}

/** Cookie header from a jar of `name=value` pairs, updated from Set-Cookie answers as a browser would. */
export class CookieJar {
	private readonly jar = new Map<string, string>();
	update(response: Response) {
		for (const header of response.headers.getSetCookie()) {
			const [pair] = header.split(';');
			const eq = pair.indexOf('=');
			if (pair.slice(eq + 1) === '' || /max-age=0/i.test(header)) this.jar.delete(pair.slice(0, eq));
			else this.jar.set(pair.slice(0, eq), pair.slice(eq + 1));
		}
	}
	get header() {
		return [...this.jar].map(([k, v]) => `${k}=${v}`).join('; ');
	}
}
