// A fake SMTP server for tests and the load run (scripts/mail-fake.ts as a child process), when
// none listens already, and free loopback ports. No test environment is imported here, so
// scripts outside vitest (scripts/load.ts) can use it too.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp } from 'node:fs/promises';
import { createConnection, createServer as createNetServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export function freePort(): Promise<number> {
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
export async function ensureMailFake(): Promise<{ child: ChildProcess; dir: string } | null> {
	if (process.env.SMTP_PORT && process.env.MAIL_DIR && (await listening(Number(process.env.SMTP_PORT)))) return null;
	const port = await freePort();
	process.env.SMTP_PORT = String(port);
	process.env.MAIL_DIR = await mkdtemp(join(tmpdir(), 'loopwright-mail-'));
	// One process (node with tsx's loader), so stop() reaches the server itself and not a wrapper.
	const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/mail-fake.ts'], { env: process.env, stdio: 'ignore' });
	for (let i = 0; i < 80 && !(await listening(port)); i++) await new Promise((r) => setTimeout(r, 100));
	return { child, dir: process.env.MAIL_DIR };
}
