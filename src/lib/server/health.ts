// Database liveness for /api/health: one cheap query with a short timeout, so a dead server
// answers "down" in about a second instead of hanging the probe.
import { sql } from 'drizzle-orm';
import type { Database } from './db';

export async function databaseAnswers(db: Database, timeoutMs = 1500): Promise<boolean> {
	let timer: ReturnType<typeof setTimeout> | undefined;
	const timeout = new Promise<false>((resolve) => {
		timer = setTimeout(() => resolve(false), timeoutMs);
	});
	const probe = db
		.execute(sql`select 1`)
		.then(() => true as const)
		.catch(() => false as const);
	try {
		return await Promise.race([probe, timeout]);
	} finally {
		clearTimeout(timer);
	}
}
