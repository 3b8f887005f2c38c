// The demo's history spread over past working days. The seed saves, reviews and comments on every
// demo revision within a few seconds, so the home page's activity and every "saved at" would
// read the same minute; a team's record spans weeks. The audit trail lists the seed's actions in
// order (each service writes its audit row last): action k moves to a past working-day time, the
// first at 09:00 about three weeks ago, each next one 25–180 minutes later within 09:00–18:00 on
// weekdays; every other time of the workspace (a revision's save, a status change, a comment)
// moves with the first action at or after it, keeping its sub-second distance, so the rows of one
// action stay together and every order is kept. Deterministic (no clock but the seed's "now").
import type { Pool } from 'mysql2/promise';

/** Every timestamp column of the workspace's own rows (the tables all carry workspace_id). */
const STAMPED: Record<string, string[]> = {
	project: ['created_at', 'updated_at'],
	rail: ['created_at', 'updated_at'],
	loop_revision: ['created_at', 'status_changed_at'],
	loop_comment: ['created_at'],
	review_request: ['created_at', 'decided_at'],
	template: ['created_at', 'updated_at'],
	bench_file: ['created_at'],
	audit_log: ['created_at']
};

const DAY_MS = 86_400_000;
const START_HOUR = 9;
const END_HOUR = 18;

/** Minutes between event k and k + 1: a fixed, irregular-looking sequence in 25…180. */
function gapMinutes(k: number): number {
	return 25 + ((k * 97 + 41) % 156);
}

const isWeekend = (d: Date) => d.getUTCDay() === 0 || d.getUTCDay() === 6;

/** The next working-day time at or after `t` (UTC hours). */
function workingTime(t: Date): Date {
	const d = new Date(t);
	if (d.getUTCHours() >= END_HOUR) {
		d.setUTCDate(d.getUTCDate() + 1);
		d.setUTCHours(START_HOUR, 0, 0, 0);
	}
	if (d.getUTCHours() < START_HOUR) d.setUTCHours(START_HOUR, 0, 0, 0);
	while (isWeekend(d)) d.setUTCDate(d.getUTCDate() + 1);
	return d;
}

/**
 * New times for `count` ordered events, all before `now`: walked forward from a start far enough
 * back, then, if the walk would pass `now`, started earlier by whole days until it does not.
 */
export function spreadTimes(count: number, now: Date): Date[] {
	for (let daysBack = 21; ; daysBack += 7) {
		const start = new Date(now.getTime() - daysBack * DAY_MS);
		start.setUTCHours(START_HOUR, 0, 0, 0);
		const times: Date[] = [];
		let t = workingTime(start);
		for (let k = 0; k < count; k++) {
			times.push(t);
			t = workingTime(new Date(t.getTime() + gapMinutes(k) * 60_000));
		}
		if (count === 0 || times[count - 1].getTime() < now.getTime() - 3_600_000) return times;
	}
}

/** The new time of `stamp`: with the first action at or after it, at the same distance before it. */
export function movedTime(stamp: number, actions: number[], moved: Date[]): Date {
	let lo = 0;
	let hi = actions.length;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if (actions[mid] < stamp) lo = mid + 1;
		else hi = mid;
	}
	if (lo === actions.length) return new Date(moved[actions.length - 1].getTime() + (stamp - actions[actions.length - 1]));
	return new Date(moved[lo].getTime() - (actions[lo] - stamp));
}

/** Moves the workspace's seeded times onto the spread, in one transaction. Returns how many actions moved. */
export async function spreadDemoHistory(pool: Pool, workspaceId: string, now = new Date()): Promise<number> {
	const connection = await pool.getConnection();
	try {
		await connection.beginTransaction();
		const [auditRows] = await connection.query('SELECT DISTINCT created_at AS t FROM audit_log WHERE workspace_id = ? ORDER BY created_at', [workspaceId]);
		const actions = (auditRows as { t: Date }[]).map((r) => r.t.getTime());
		if (!actions.length) {
			await connection.commit();
			return 0;
		}
		const moved = spreadTimes(actions.length, now);
		for (const [table, columns] of Object.entries(STAMPED)) {
			for (const column of columns) {
				const [rows] = await connection.query(`SELECT DISTINCT \`${column}\` AS t FROM \`${table}\` WHERE workspace_id = ? AND \`${column}\` IS NOT NULL`, [workspaceId]);
				const stamps = (rows as { t: Date }[]).map((r) => r.t.getTime());
				if (!stamps.length) continue;
				// One CASE per column; the new times are weeks before any old one, so no row matches twice.
				const cases = stamps.map(() => 'WHEN ? THEN ?').join(' ');
				const args = stamps.flatMap((t) => [new Date(t), movedTime(t, actions, moved)]);
				await connection.query(`UPDATE \`${table}\` SET \`${column}\` = CASE \`${column}\` ${cases} ELSE \`${column}\` END WHERE workspace_id = ? AND \`${column}\` IS NOT NULL`, [...args, workspaceId]);
			}
		}
		await connection.commit();
		return actions.length;
	} catch (error) {
		await connection.rollback();
		throw error;
	} finally {
		connection.release();
	}
}
