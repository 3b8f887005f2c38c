// The switching check kept with a revision: run on the stored design in the analysis pool (the
// caller's slots, its time and memory budget), then written beside the stored verdict with its
// engine version. A revision whose kept check is from the current engine and the same
// frequencies answers that check without running again, so repeating the request costs nothing.
import { and, asc, eq, isNotNull, sql } from 'drizzle-orm';
import type { Database } from '../db';
import { loopRevision, rail } from '../db/schema';
import { ENGINE_VERSION } from '../../engine/version';
import { MAX_PERIODS_PER_POINT } from '../../engine/switching/check';
import type { StoredSwitchingCheck } from '../../verdict/switchingText';
import * as analyses from '../analysis-pool';
import { ApiError } from '../http/errors';
import * as audit from './audit';
import type { Actor } from './types';
import type { Loop } from './signoff';


/** The measurable span: fsw/MAX_PERIODS_PER_POINT … fsw/2. */
function checkFrequencies(freqHz: number[] | undefined, fswHz: number): number[] | null {
	if (!freqHz) return null;
	const fields: Record<string, string> = {};
	freqHz.forEach((f, i) => {
		if (f > fswHz / 2) fields[`freqHz.${i}`] = `must be at most fsw/2 (${fswHz / 2} Hz)`;
		else if (f < fswHz / MAX_PERIODS_PER_POINT) fields[`freqHz.${i}`] = `must be at least fsw/${MAX_PERIODS_PER_POINT} (${fswHz / MAX_PERIODS_PER_POINT} Hz)`;
	});
	if (Object.keys(fields).length) throw new ApiError(400, 'invalid-request', 'a frequency is outside what the switching check can measure', fields);
	return [...freqHz].sort((a, b) => a - b);
}

const sameList = (a: number[] | null, b: number[] | null) => (a === null || b === null ? a === b : a.length === b.length && a.every((x, i) => x === b[i]));

/** Runs (or reuses) the switching check of `loop`'s stored design and keeps it with the revision. */
export async function run(db: Database, actor: Actor, loop: Loop, request: { freqHz?: number[] }): Promise<{ check: StoredSwitchingCheck; reused: boolean }> {
	const design = loop.design as { plant?: { fsw?: unknown } };
	const fsw = typeof design.plant?.fsw === 'number' ? design.plant.fsw : NaN;
	const freqHz = checkFrequencies(request.freqHz, fsw);
	const kept = loop.switchingCheck;
	if (kept && kept.engineVersion === ENGINE_VERSION && sameList(kept.freqHz, freqHz)) return { check: kept, reused: true };
	const result = await analyses.switchingCheck(actor.userId, loop.design, freqHz ?? undefined);
	if ('error' in result) throw new ApiError(422, result.error.code, `the stored design cannot be checked: ${result.error.message}`, result.error.fields);
	const check: StoredSwitchingCheck = { engineVersion: ENGINE_VERSION, computedAt: new Date().toISOString(), requestedBy: actor.userId, freqHz, result };
	await db.transaction(async (tx) => {
		await tx.update(loopRevision).set({ switchingCheck: check }).where(eq(loopRevision.id, loop.id));
		await audit.record(tx, {
			workspaceId: loop.workspaceId,
			actor,
			action: 'loop.switching-check',
			entityType: 'loop',
			entityId: loop.id,
			after: {
				revision: loop.revision,
				status: result.status,
				phaseMarginDeg: result.switching.phaseMarginDeg,
				crossoverHz: result.switching.crossoverHz,
				engineVersion: ENGINE_VERSION
			}
		});
	});
	return { check, reused: false };
}

export interface OlderSwitchingCheck {
	railName: string;
	revision: number;
	/** The engine version the kept check was computed with. */
	engineVersion: string;
}

/**
 * The revisions whose kept switching check came from another engine version. `npm run reverify`
 * lists them and does not re-run them: a check costs seconds of CPU each and runs in the analysis
 * pool when someone asks for it (POST …/switching-check answers a fresh one then).
 */
export async function olderChecks(db: Database): Promise<OlderSwitchingCheck[]> {
	const version = sql<string>`JSON_UNQUOTE(JSON_EXTRACT(${loopRevision.switchingCheck}, '$.engineVersion'))`;
	return db
		.select({ railName: rail.name, revision: loopRevision.revision, engineVersion: version })
		.from(loopRevision)
		.innerJoin(rail, eq(rail.id, loopRevision.railId))
		.where(and(isNotNull(loopRevision.switchingCheck), sql`NOT (${version} <=> ${ENGINE_VERSION})`))
		.orderBy(asc(rail.name), asc(loopRevision.revision));
}

