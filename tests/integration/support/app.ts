// Starts the real app (Vite dev server with SvelteKit, hooks and routes) on a free loopback
// port, after migrating the test database and making sure a fake SMTP server is listening
// (the one `npm test` started, or our own child process of scripts/mail-fake.ts).
import './env';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { createConnection, createServer as createNetServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createServer, type ViteDevServer } from 'vite';
import { inject } from 'vitest';

export interface RunningApp {
	origin: string;
	mailDir: string;
	stop(): Promise<void>;
}

function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = createNetServer();
		server.once('error', reject);
		server.listen(0, '127.0.0.1', () => {
			const address = server.address();
			server.close(() => resolve(typeof address === 'object' && address ? address.port : 0));
		});
	});
}

function listening(port: number): Promise<boolean> {
	return new Promise((resolve) => {
		const socket = createConnection({ host: '127.0.0.1', port });
		socket.once('connect', () => (socket.destroy(), resolve(true)));
		socket.once('error', () => resolve(false));
	});
}

/** Our own fake SMTP server and its folder, when no fake was listening already. */
async function ensureMailFake(): Promise<{ child: ChildProcess; dir: string } | null> {
	if (process.env.SMTP_PORT && process.env.MAIL_DIR && (await listening(Number(process.env.SMTP_PORT)))) return null;
	const port = await freePort();
	process.env.SMTP_PORT = String(port);
	process.env.MAIL_DIR = await mkdtemp(join(tmpdir(), 'loopwright-mail-'));
	// One process (node with tsx's loader), so stop() reaches the server itself and not a wrapper.
	const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/mail-fake.ts'], { env: process.env, stdio: 'ignore' });
	for (let i = 0; i < 80 && !(await listening(port)); i++) await new Promise((r) => setTimeout(r, 100));
	return { child, dir: process.env.MAIL_DIR };
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
	// The captured-mail reader in the test process looks in the same folder as the server.
	process.env.MAIL_DIR = mailDir;
	return { origin, mailDir };
}
