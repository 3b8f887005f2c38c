// Keeps the production server up (`npm start` runs it): starts `node <entry>` (default: build)
// and starts it again whenever it exits without being asked to (a crash, V8 out of memory, a
// kill by the system), logging each restart with its cause. Quick repeated crashes back off up
// to 30 s. SIGTERM / SIGINT go to the server, and the supervisor ends when the server has.
import { spawn } from 'node:child_process';

const entry = process.argv[2] ?? 'build';
/** A server that ran this long before exiting counts as healthy: restart at once. */
const HEALTHY_UPTIME_MS = Number(process.env.SUPERVISE_HEALTHY_MS ?? 10_000);
const FIRST_DELAY_MS = 500;
const MAX_DELAY_MS = 30_000;

const log = (message) => console.error(`[loopwright] ${new Date().toISOString()} ${message}`);

let child = null;
let stopping = false;
let restarts = 0;
let delay = FIRST_DELAY_MS;

function start() {
	const startedAt = Date.now();
	child = spawn(process.execPath, [entry], { stdio: 'inherit', env: process.env });
	child.on('exit', (code, signal) => {
		child = null;
		if (stopping) process.exit(code ?? 0);
		delay = Date.now() - startedAt < HEALTHY_UPTIME_MS ? Math.min(MAX_DELAY_MS, delay * 2) : FIRST_DELAY_MS;
		restarts++;
		log(`the server exited on its own (${signal ? `signal ${signal}` : `exit code ${code}`}); restart ${restarts} in ${delay} ms`);
		setTimeout(start, delay);
	});
}

for (const signal of ['SIGTERM', 'SIGINT']) {
	process.on(signal, () => {
		stopping = true;
		if (child) child.kill(signal);
		else process.exit(0);
	});
}

start();
