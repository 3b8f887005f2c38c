// Starts the real app (Vite dev server with SvelteKit, hooks and routes) on a free loopback
// port, after migrating the test database and making sure a fake SMTP server is listening
// (the one `npm test` started, or our own child process of scripts/mail-fake.ts).
import './env';
import { spawn } from 'node:child_process';
import { createServer as createHttpServer, request as httpRequest } from 'node:http';
import { rm } from 'node:fs/promises';
import { createServer, type ViteDevServer } from 'vite';
import { inject } from 'vitest';
import { ensureMailFake, freePort } from './mail-fake';

export interface RunningApp {
	origin: string;
	mailDir: string;
	stop(): Promise<void>;
}

async function migrate() {
	const { drizzle } = await import('drizzle-orm/mysql2');
	const { migrate } = await import('drizzle-orm/mysql2/migrator');
	const mysql = (await import('mysql2/promise')).default;
	const { databaseUrl } = await import('../../../src/lib/server/env');
	const connection = await mysql.createConnection({ uri: databaseUrl(), multipleStatements: true });
	try {
		await migrate(drizzle(connection), { migrationsFolder: 'drizzle' });
	} finally {
		await connection.end();
	}
}

export async function startApp(): Promise<RunningApp> {
	await migrate();
	const mailer = await ensureMailFake();
	const port = await freePort();
	process.env.ORIGIN = `http://127.0.0.1:${port}`;
	const server: ViteDevServer = await createServer({
		configFile: 'vite.config.ts',
		logLevel: 'error',
		server: { host: '127.0.0.1', port, strictPort: true, hmr: false, watch: null }
	});
	await server.listen();
	return {
		origin: process.env.ORIGIN,
		mailDir: process.env.MAIL_DIR!,
		async stop() {
			await server.close();
			// The app's database pool closes on adapter-node's shutdown event (db/index.ts);
			// without it the open pool keeps vitest from exiting.
			(process.emit as (event: string, ...args: unknown[]) => boolean)('sveltekit:shutdown', 'SIGTERM');
			if (mailer) {
				mailer.child.kill('SIGTERM');
				await rm(mailer.dir, { recursive: true, force: true });
			}
		}
	};
}

/** The app served by global-setup.ts, as seen from a test file. */
export function servedApp(): { origin: string; mailDir: string } {
	const origin = inject('appOrigin');
	const mailDir = inject('mailDir');
	// The captured-mail reader in the test process looks in the same folder as the server, and
	// further instances started from here mail to the same fake.
	process.env.MAIL_DIR = mailDir;
	process.env.SMTP_PORT = inject('smtpPort');
	return { origin, mailDir };
}

export interface Instance {
	/** Where this instance listens. */
	url: string;
	stop(): Promise<void>;
}

/**
 * A load balancer for tests on 127.0.0.1:`port`: passes each request on to one of `targets`
 * (round robin, or the index in an `x-instance` header) with its Host header, from the client's
 * own loopback address, so each instance sees the public address and the real client address.
 */
export function startBalancer(port: number, targets: string[]): Promise<{ close(): Promise<void> }> {
	let turn = 0;
	const server = createHttpServer((req, res) => {
		const chosen = req.headers['x-instance'] !== undefined ? Number(req.headers['x-instance']) : turn++ % targets.length;
		const target = new URL(targets[chosen]);
		const upstream = httpRequest(
			{ host: target.hostname, port: target.port, method: req.method, path: req.url, headers: req.headers, localAddress: req.socket.remoteAddress },
			(answer) => {
				res.writeHead(answer.statusCode ?? 502, answer.headers);
				answer.pipe(res);
			}
		);
		upstream.once('error', () => {
			res.statusCode = 502;
			res.end();
		});
		req.pipe(upstream);
	});
	return new Promise((resolve) =>
		server.listen(port, '127.0.0.1', () =>
			resolve({
				close: () =>
					new Promise<void>((done) => {
						server.closeAllConnections();
						server.close(() => done());
					})
			})
		)
	);
}

/**
 * Another app instance in a child process (tests/integration/support/serve-instance.ts) on a free
 * port, with this process's environment plus `env` (ORIGIN: the public address every instance
 * shares behind a load balancer). Resolves once its /api/health answers 200.
 */
export async function startInstance(env: Record<string, string>): Promise<Instance> {
	const port = await freePort();
	const child = spawn(process.execPath, ['--import', 'tsx', 'tests/integration/support/serve-instance.ts'], {
		env: { ...process.env, ...env, PORT: String(port) },
		stdio: ['ignore', 'ignore', 'inherit']
	});
	const url = `http://127.0.0.1:${port}`;
	const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
	for (let i = 0; i < 600; i++) {
		const ok = await fetch(`${url}/api/health`).then((r) => r.ok, () => false);
		if (ok) break;
		if (child.exitCode !== null) throw new Error(`instance on ${port} exited with ${child.exitCode}`);
		await new Promise((r) => setTimeout(r, 200));
	}
	return {
		url,
		async stop() {
			child.kill('SIGTERM');
			await exited;
		}
	};
}
