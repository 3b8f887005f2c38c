/**
 * A rail's "verdict changed" flag: re-verification after an engine change (`engine`) or after a
 * change of the template its network was placed from (`template`) gave its latest revision
 * another verdict. Stored on the rail, shown on the board table and the rail screen, cleared
 * when acknowledged or when a new revision is saved. Shared by server and browser.
 */
import type { Verification, VerdictStatus } from '../engine/verify/types';

/** The part of a verdict a flag and a diff compare. */
export interface VerdictBrief {
	status: VerdictStatus;
	summary: string;
	engineVersion: string;
	/** Status per verdict row (pm, gm, fc, stability, yield, model). */
	rows: Record<string, VerdictStatus>;
}

export interface VerdictFlag {
	cause: 'engine' | 'template';
	loopId: string;
	revision: number;
	before: VerdictBrief;
	after: VerdictBrief;
	/** The template whose change was tried on the rail (cause `template`). */
	template?: { id: string; name: string };
	/** ISO time of the re-verification. */
	at: string;
}

export function briefOf(v: Verification): VerdictBrief {
	return { status: v.status, summary: v.summary, engineVersion: v.engineVersion, rows: Object.fromEntries(v.rows.map((r) => [r.metric, r.status])) };
}

/** A verdict changed when its status or the status of any of its rows differs. */
export function verdictChanged(before: VerdictBrief, after: VerdictBrief): boolean {
	if (before.status !== after.status) return true;
	const keys = new Set([...Object.keys(before.rows), ...Object.keys(after.rows)]);
	for (const k of keys) if (before.rows[k] !== after.rows[k]) return true;
	return false;
}

/** One line for people: "pass → caution (engine 2 → 3)". */
export function flagText(f: VerdictFlag): string {
	const why = f.cause === 'engine' ? `engine ${f.before.engineVersion} → ${f.after.engineVersion}` : `template “${f.template?.name ?? '?'}” changed; re-placed on this rail`;
	return `r${f.revision}: ${f.before.status} → ${f.after.status} (${why})`;
}
