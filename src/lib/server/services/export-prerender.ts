// After a save, the files a person downloads first (the sign-off PDF and the plot PNG and SVG
// with the corners, as the rail screen links them) are drawn in the background into the export
// cache, so the first download is a kept file. Never on the save's path: the caller does not
// wait. Bounded per user: one pre-render at a time, and while it runs only the user's newest
// saved revision waits (an older waiting one is dropped). It runs in the analysis pool under
// its own name per user, so it never takes the slots of the user's own requests, and the
// pool's queue limit and budgets still apply; a refusal or failure only means the first
// download draws the file itself.
import type { Database } from '../db';
import * as loops from './loops';
import * as signoff from './signoff';
import { plotFile } from './plot-export';

const running = new Set<string>();
const waiting = new Map<string, string>();

/** Queues the pre-render of revision `loopId`, saved by `userId`; returns at once. */
export function prerenderExports(db: Database, loopId: string, userId: string): void {
	if (running.has(userId)) {
		waiting.set(userId, loopId);
		return;
	}
	running.add(userId);
	void run(db, loopId, userId);
}

async function run(db: Database, loopId: string, userId: string) {
	let next: string | undefined = loopId;
	try {
		while (next) {
			await draw(db, next, `prerender:${userId}`);
			next = waiting.get(userId);
			waiting.delete(userId);
		}
	} finally {
		running.delete(userId);
	}
}

async function draw(db: Database, loopId: string, owner: string) {
	try {
		const row = await loops.get(db, loopId);
		if (!row) return;
		const { rail } = await signoff.context(db, row);
		const base = `${rail?.name ?? 'loop'}-r${row.revision}`;
		await plotFile(owner, row, 'png', { corners: '1' }, base);
		await signoff.reportPdf(db, row, owner);
		await plotFile(owner, row, 'svg', { corners: '1' }, base);
	} catch (e) {
		console.warn(`[exports] pre-render of ${loopId} skipped: ${e instanceof Error ? e.message : String(e)}`);
	}
}

/** For tests: whether a pre-render of `userId` is running or waiting. */
export function prerenderPending(userId: string): boolean {
	return running.has(userId) || waiting.has(userId);
}
