// Stored verdicts over time: re-verification of stored revisions after an engine change (or
// for rows written before verdicts were stored: their missing spec sections are filled from
// the rail first), and the "verdict changed" flag of a rail whose latest revision got another
// verdict, from an engine change or from a change of the template its network came from.
import { and, asc, eq, gt, inArray, isNull, ne, or, sql } from 'drizzle-orm';
import type { Database } from '../db';
import { loopRevision, rail, type template } from '../db/schema';
import { ENGINE_VERSION } from '../../engine/version';
import { briefOf, verdictChanged, type VerdictBrief, type VerdictFlag } from '../../verdict/flag';
import { SPEC_SECTIONS } from '../../spec/railSpec';
import { completeSpec } from './rail-spec';
import { verifyDocument } from './verify';
import type { Rail } from './rails';

export interface ReverifyEntry {
	railId: string;
	railName: string;
	revision: number;
	before: VerdictBrief | null;
	after: VerdictBrief | null;
	/** Why the revision has no verdict (the engine refused the stored document). */
	error: string | null;
	/** The rail was flagged (its latest revision's verdict changed). */
	flagged: boolean;
	/** Missing spec sections were filled from the rail (rows saved before specs were stored). */
	specFilled: boolean;
}

const BATCH = 25;

/**
 * Re-verifies every stored revision whose verdict is missing or came from another engine
 * version (`all`: every revision), in batches of 25 rows so memory stays bounded. The latest
 * revision of a rail whose verdict changed flags the rail (cause `engine`).
 */
export async function reverify(db: Database, options: { all?: boolean; onEntry?: (e: ReverifyEntry) => void } = {}): Promise<ReverifyEntry[]> {
	const out: ReverifyEntry[] = [];
	const stale = options.all ? undefined : or(isNull(loopRevision.verification), isNull(loopRevision.engineVersion), ne(loopRevision.engineVersion, ENGINE_VERSION));
	const rails = new Map<string, Rail>();
	const latest = new Map<string, number>();
	let after = '';
	for (;;) {
		const rows = await db
			.select()
			.from(loopRevision)
			.where(and(gt(loopRevision.id, after), stale))
			.orderBy(asc(loopRevision.id))
			.limit(BATCH);
		if (rows.length === 0) break;
		after = rows[rows.length - 1].id;
		const need = [...new Set(rows.map((r) => r.railId))].filter((id) => !rails.has(id));
		if (need.length) {
			for (const r of await db.select().from(rail).where(inArray(rail.id, need))) rails.set(r.id, r);
			const heads = await db
				.select({ railId: loopRevision.railId, latest: sql<number>`MAX(${loopRevision.revision})`.mapWith(Number) })
				.from(loopRevision)
				.where(inArray(loopRevision.railId, need))
				.groupBy(loopRevision.railId);
			for (const h of heads) latest.set(h.railId, h.latest);
		}
		for (const row of rows) {
			const owner = rails.get(row.railId);
			if (!owner) continue;
			const entry = await reverifyRow(db, row, owner, latest.get(row.railId) === row.revision);
			out.push(entry);
			options.onEntry?.(entry);
		}
	}
	return out;
}

async function reverifyRow(db: Database, row: typeof loopRevision.$inferSelect, owner: Rail, isLatest: boolean): Promise<ReverifyEntry> {
	const specFilled = SPEC_SECTIONS.some((k) => row.design[k] === undefined);
	const design = specFilled ? await completeSpec(db, owner, row.design) : row.design;
	const before = row.verification ? briefOf(row.verification) : null;
	const base = { railId: owner.id, railName: owner.name, revision: row.revision, before, specFilled };
	const v = await verifyDocument(design);
	if ('error' in v) {
		if (specFilled) await db.update(loopRevision).set({ design }).where(eq(loopRevision.id, row.id));
		return { ...base, after: null, error: v.error.message, flagged: false };
	}
	const now = briefOf(v);
	const flag: VerdictFlag | null =
		isLatest && before && verdictChanged(before, now) ? { cause: 'engine', loopId: row.id, revision: row.revision, before, after: now, at: new Date().toISOString() } : null;
	await db.transaction(async (tx) => {
		await tx.update(loopRevision).set({ design, verification: v, engineVersion: v.engineVersion }).where(eq(loopRevision.id, row.id));
		if (flag) await tx.update(rail).set({ verdictFlag: flag }).where(eq(rail.id, owner.id));
	});
	return { ...base, after: now, error: null, flagged: !!flag };
}

/**
 * After `tpl` changed: each rail whose latest revision was placed from it gets the new strategy
 * placed on that revision's document (its own spec kept) and verified; where the verdict would
 * differ from the stored one the rail is flagged (cause `template`). Stored revisions stay as
 * they are: adopting the change is a new revision by an engineer.
 */
export async function afterTemplateChange(
	db: Database,
	tpl: Pick<typeof template.$inferSelect, 'id' | 'name' | 'workspaceId' | 'compensator'>,
	users: { railId: string }[],
	place: (base: Record<string, unknown>) => Record<string, unknown>
): Promise<{ railId: string; railName: string; revision: number; before: VerdictBrief | null; after: VerdictBrief | null; error: string | null; flagged: boolean }[]> {
	const out = [];
	for (const u of users) {
		const [owner] = await db.select().from(rail).where(and(eq(rail.id, u.railId), eq(rail.workspaceId, tpl.workspaceId))).limit(1);
		if (!owner) continue;
		const [head] = await db.select().from(loopRevision).where(eq(loopRevision.railId, owner.id)).orderBy(sql`${loopRevision.revision} DESC`).limit(1);
		if (!head) continue;
		const before = head.verification ? briefOf(head.verification) : null;
		// A template edit re-verifies its rails in the pool, one at a time, under the template's key.
		const v = await verifyDocument(await completeSpec(db, owner, place(head.design)), `template:${tpl.id}`);
		if ('error' in v) {
			out.push({ railId: owner.id, railName: owner.name, revision: head.revision, before, after: null, error: v.error.message, flagged: false });
			continue;
		}
		const now = briefOf(v);
		const flagged = !!before && verdictChanged(before, now);
		if (flagged) {
			const flag: VerdictFlag = { cause: 'template', loopId: head.id, revision: head.revision, before: before!, after: now, template: { id: tpl.id, name: tpl.name }, at: new Date().toISOString() };
			await db.update(rail).set({ verdictFlag: flag }).where(eq(rail.id, owner.id));
		}
		out.push({ railId: owner.id, railName: owner.name, revision: head.revision, before, after: now, error: null, flagged });
	}
	return out;
}
