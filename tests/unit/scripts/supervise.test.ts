// scripts/supervise.mjs (README.md: "npm start runs the server under a supervisor"): a
// server that exits on its own is started again and the restart is logged; SIGTERM ends both.
import { spawn } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';

let dir = '';
afterEach(async () => {
	if (dir) await rm(dir, { recursive: true, force: true });
});

describe('the production supervisor', { timeout: 60_000 }, () => {
	it('restarts a server that crashes, logs it, and stops with SIGTERM', async () => {
		dir = await mkdtemp(join(tmpdir(), 'loopwright-supervise-'));
		// A stand-in server: records each start, crashes on its first two runs, then stays up
		// until SIGTERM, when it records that it was asked to stop.
		const server = join(dir, 'server.mjs');
		const starts = join(dir, 'starts');
		await writeFile(
			server,
			`import { appendFileSync, readFileSync } from 'node:fs';
			appendFileSync(${JSON.stringify(starts)}, 'start\\n');
			const n = readFileSync(${JSON.stringify(starts)}, 'utf8').trim().split('\\n').length;
			if (n <= 2) process.exit(3);
			process.on('SIGTERM', () => { appendFileSync(${JSON.stringify(starts)}, 'stopped\\n'); process.exit(0); });
			setInterval(() => {}, 1000);`
		);
		const supervisor = spawn(process.execPath, ['scripts/supervise.mjs', server], { stdio: ['ignore', 'ignore', 'pipe'] });
		let stderr = '';
		supervisor.stderr.on('data', (b) => (stderr += b));
		const exited = new Promise<number | null>((resolve) => supervisor.on('exit', (code) => resolve(code)));
		const count = async () => (await readFile(starts, 'utf8').catch(() => '')).split('\n').filter((l) => l === 'start').length;
		while ((await count()) < 3) await new Promise((r) => setTimeout(r, 100));
		expect(stderr).toMatch(/exited on its own \(exit code 3\); restart 1/);
		expect(stderr).toMatch(/restart 2/);
		supervisor.kill('SIGTERM');
		expect(await exited).toBe(0);
		expect(await readFile(starts, 'utf8')).toMatch(/start\nstart\nstart\nstopped\n$/);
	});
});
