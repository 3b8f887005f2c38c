// Fixed-window counters for the abuse limits (sign-in failures, sign-ups, reset links,
// invitations), kept in MariaDB (table rate_limit_bucket) so that every app instance behind one
// address counts together and a restart forgets nothing. A window starts at a bucket's first hit
// and lasts the limit's windowSeconds; all times are the database's clock, so instances whose
// clocks differ still agree. Each hit is one upsert under the row lock, read back in the same
// transaction: parallel requests on any instance cannot slip past the limit together.
import { createHash } from 'node:crypto';
import { sql } from 'drizzle-orm';
import type { Database } from './db';

export interface Window {
	/** Hits allowed in one window; the next one is refused. */
	max: number;
	windowSeconds: number;
}

export interface Count {
	hits: number;
	/** Whole seconds until the window ends (0 when no window is open). */
	retryAfterS: number;
}

/** The bucket of one limit for one subject: the limit's name and a SHA-256 of the subject's parts (address, e-mail, id). */
export function bucketOf(limit: string, ...subject: string[]): string {
	if (limit.length > 32) throw new Error(`limit name too long: ${limit}`);
	return `${limit}:${createHash('sha256').update(subject.join('\u0000')).digest('hex')}`;
}

/** Seconds to wait when `count` is over `window`, else 0. */
export function overLimit(count: Count, window: Window): number {
	return count.hits > window.max ? Math.max(1, count.retryAfterS) : 0;
}

type Row = { hits: number; retryAfterS: number | string | null };

const RETRY_AFTER = sql`GREATEST(0, CEIL(TIMESTAMPDIFF(MICROSECOND, UTC_TIMESTAMP(3), resets_at) / 1000000))`;

/** Ended windows are deleted in batches every this many hits of one process, so the table stays small. */
const SWEEP_EVERY = 500;
let hitsSinceSweep = 0;

export class RateLimiter {
	constructor(private readonly db: Database) {}

	private static countOf(rows: unknown): Count {
		const row = (rows as Row[])[0];
		return row ? { hits: Number(row.hits), retryAfterS: Number(row.retryAfterS ?? 0) } : { hits: 0, retryAfterS: 0 };
	}

	/** Adds one hit to the bucket (opening a new window when the last one ended) and answers the count with it. */
	async hit(bucket: string, window: Window): Promise<Count> {
		const count = await this.db.transaction(async (tx) => {
			// Assignments run left to right: `hits` reads the old resets_at, then resets_at is renewed.
			await tx.execute(sql`
				INSERT INTO rate_limit_bucket (bucket, hits, resets_at)
				VALUES (${bucket}, 1, UTC_TIMESTAMP(3) + INTERVAL ${window.windowSeconds} SECOND)
				ON DUPLICATE KEY UPDATE
					hits = IF(resets_at <= UTC_TIMESTAMP(3), 1, hits + 1),
					resets_at = IF(resets_at <= UTC_TIMESTAMP(3), VALUES(resets_at), resets_at)`);
			const [rows] = await tx.execute(sql`SELECT hits, ${RETRY_AFTER} AS retryAfterS FROM rate_limit_bucket WHERE bucket = ${bucket}`);
			return RateLimiter.countOf(rows);
		});
		if (++hitsSinceSweep >= SWEEP_EVERY) {
			hitsSinceSweep = 0;
			await this.db.execute(sql`DELETE FROM rate_limit_bucket WHERE resets_at < UTC_TIMESTAMP(3) LIMIT 5000`);
		}
		return count;
	}

	/** The bucket's count in its open window, without adding to it. */
	async peek(bucket: string): Promise<Count> {
		const [rows] = await this.db.execute(
			sql`SELECT hits, ${RETRY_AFTER} AS retryAfterS FROM rate_limit_bucket WHERE bucket = ${bucket} AND resets_at > UTC_TIMESTAMP(3)`
		);
		return RateLimiter.countOf(rows);
	}

	/** Takes back one hit (a request that was counted in advance and turned out not to be one). */
	async refund(bucket: string): Promise<void> {
		await this.db.execute(sql`UPDATE rate_limit_bucket SET hits = GREATEST(hits - 1, 0) WHERE bucket = ${bucket} AND resets_at > UTC_TIMESTAMP(3)`);
	}

	/** Forgets the bucket (a right password ends the count of wrong ones). */
	async clear(bucket: string): Promise<void> {
		await this.db.execute(sql`DELETE FROM rate_limit_bucket WHERE bucket = ${bucket}`);
	}
}
