// The sign-off view of one loop revision, assembled for the review page, the exports and the
// PDF report: its rail and board, the verdict stored with it at save (never recomputed here),
// the spec it was judged with, what the engineer saw (parts, warnings, operating point, closed
// loop and steps, the plot with the corners that set the verdict), the review trail (requests,
// comments, decisions from the audit log), the differences (parameters and verdict) to the
// previous revision and to the last approved one, and the report itself.
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { Database } from '../db';
import { auditLog, project, user } from '../db/schema';
import { buildSignoffPdf, type ReviewEntry } from '../exports';
import { cachedExport, exportKey } from '../exports/cache';
import * as loops from './loops';
import * as rails from './rails';
import * as reviews from './reviews';
import { verdictFigures } from '../../verdict/figures';
import * as analyses from '../analysis-pool';
import { controlOf, modulatorText } from '../../text/controlMode';
import { parameterDiff, verdictDiff } from './loop-analysis';

export type Loop = NonNullable<Awaited<ReturnType<typeof loops.get>>>;

export async function context(db: Database, loop: Loop) {
	const rail = await rails.get(db, loop.railId);
	const [board] = rail ? await db.select({ id: project.id, name: project.name }).from(project).where(eq(project.id, rail.projectId)).limit(1) : [];
	return { rail, board: board ?? null };
}

/** The revision's changes against an earlier one: parameters of the document and rows of the verdict. */
function diffAgainst(base: Awaited<ReturnType<typeof loops.previous>>, loop: Loop) {
	if (!base) return null;
	return {
		baseRevision: base.revision,
		baseId: base.id,
		baseStatus: base.status,
		changes: parameterDiff(base.design, loop.design),
		verdict: verdictDiff(base.verification, loop.verification)
	};
}

/** Rows of the corner table: the corners that set a worst value first, then the lowest phase margins, at most 24. */
function cornerRows(v: NonNullable<Loop['verification']>) {
	const list = v.corners.list ?? [];
	const named = new Set([v.worst.phaseMarginDeg, v.worst.gainMarginDb, v.worst.crossoverLowHz, v.worst.crossoverHighHz].filter((x) => x).map((x) => x!.corner));
	const score = (c: (typeof list)[number]) => (c.error || c.closedLoopStable === false ? -1e9 : (c.phaseMarginDeg ?? -1e9));
	const sorted = [...list].sort((a, b) => Number(named.has(b.label)) - Number(named.has(a.label)) || score(a) - score(b));
	return sorted.slice(0, 24).map((c) => ({ ...c, setsWorst: named.has(c.label) }));
}

const ACTION_WORDS: Record<string, string> = {
	'loop.save': 'saved the revision',
	'loop.request-review': 'requested review',
	'review.request': 'asked a reviewer',
	'loop.comment': 'commented',
	'loop.approve': 'approved',
	'loop.request-changes': 'requested changes'
};

/** The review trail of a revision, oldest first, from the audit log (the record that cannot be edited). */
export async function trail(db: Database, loop: Loop): Promise<(ReviewEntry & { action: string; code: string })[]> {
	const rows = await db
		.select()
		.from(auditLog)
		.where(and(eq(auditLog.workspaceId, loop.workspaceId), eq(auditLog.entityId, loop.id), inArray(auditLog.action, Object.keys(ACTION_WORDS))))
		.orderBy(asc(auditLog.id));
	const ids = [...new Set(rows.map((r) => r.actorId).filter((x): x is string => !!x))];
	const extra = rows.map((r) => (r.after as { reviewerId?: string } | null)?.reviewerId).filter((x): x is string => !!x);
	const people = ids.length || extra.length ? await db.select({ id: user.id, name: user.name }).from(user).where(inArray(user.id, [...ids, ...extra])) : [];
	const name = (id: string | null | undefined) => people.find((p) => p.id === id)?.name ?? 'someone';
	return rows.map((r) => {
		const after = (r.after ?? {}) as { comment?: string; body?: string; freqHz?: number; reviewerId?: string; message?: string };
		const note = r.action === 'review.request' ? name(after.reviewerId) : (after.comment ?? after.body ?? (r.action === 'loop.save' ? after.message : undefined));
		return { at: r.createdAt, who: r.actorEmail ? name(r.actorId) : 'someone', action: ACTION_WORDS[r.action] ?? r.action, code: r.action, note, freqHz: after.freqHz };
	});
}

/** What the review page shows from the database alone: the stored verdict, spec, comments, trail and diffs (no analysis). */
export async function reviewRecord(db: Database, loop: Loop) {
	const [{ rail, board }, comments, requests, history, previous, approved] = await Promise.all([
		context(db, loop),
		loops.comments(db, loop.id),
		reviews.requestsFor(db, loop.id),
		trail(db, loop),
		loops.previous(db, loop.railId, loop.revision),
		reviews.lastApproved(db, loop.railId, loop.revision)
	]);
	const v = loop.verification;
	const doc = loop.design as { corners?: unknown; tolerances?: unknown; spread?: unknown };
	const common = {
		loop: { id: loop.id, workspaceId: loop.workspaceId, revision: loop.revision, status: loop.status, message: loop.message, authorId: loop.authorId, authorName: loop.authorName, createdAt: loop.createdAt, templateId: loop.templateId },
		rail: rail ? { id: rail.id, name: rail.name, projectId: rail.projectId, topology: rail.topology, fsw: rail.fsw, vout: rail.vout, verdictFlag: rail.verdictFlag } : null,
		board,
		/** The stored verdict without its per-corner list (the corner table below carries the rows that matter). */
		verification: v ? { ...v, corners: { ...v.corners, list: undefined } } : null,
		figures: v ? verdictFigures(v) : null,
		corners: v ? cornerRows(v) : [],
		/** The switching check kept with the revision (run on request, services/switching-check.ts), or null. */
		switchingCheck: loop.switchingCheck ?? null,
		spec: { targets: v?.targets ?? null, corners: doc.corners ?? null, tolerances: doc.tolerances ?? null, spread: doc.spread ?? null },
		comments,
		requests,
		trail: history,
		diffs: { previous: diffAgainst(previous, loop), approved: diffAgainst(approved, loop) }
	};
	return common;
}

/** What the engineer saw, drawn again from the stored design in the analysis pool (for `owner`): plot, operating point, closed loop, steps. */
export async function reviewDrawing(loop: Loop, owner: string) {
	const detail = await analyses.stored(owner, { design: loop.design, verification: loop.verification, steps: true, sensitivity: true });
	if ('error' in detail) return { analysisError: detail.error, plot: null, operatingPoint: null, modulator: null, network: null, closedLoop: null, steps: null, sensitivity: null };
	const r = detail.response;
	const m = r.metrics;
	const traces = detail.cornerTraces;
	return {
		analysisError: null,
		plot: {
			freqHz: r.response.freqHz,
			nominal: { loop: r.response.loop, plant: r.response.plant, compensator: r.response.compensator },
			corners: traces,
			crossover: m.crossoverHz !== null && m.phaseMarginDeg !== null ? { freqHz: m.crossoverHz, phaseMarginDeg: m.phaseMarginDeg } : null,
			gainMargin: m.gainMarginDb !== null && m.phaseCrossoverHz !== null ? { freqHz: m.phaseCrossoverHz, gainMarginDb: m.gainMarginDb } : null,
			modelLimitHz: detail.document.plant.fsw / 2
		},
		operatingPoint: r.operatingPoint,
		// The control method in words, and for peak current mode the current loop's slopes, mc and Qp.
		modulator: {
			control: controlOf(detail.document.modulator.control),
			text: modulatorText(detail.document.modulator, r.features.currentMode),
			currentMode: r.features.currentMode ?? null
		},
		network: { kind: r.compensator.kind, zerosHz: (r.compensator.rounded ?? r.compensator.ideal).zerosHz, polesHz: (r.compensator.rounded ?? r.compensator.ideal).polesHz },
		closedLoop: { stable: m.closedLoopStable, modulusMargin: m.modulusMargin, modulusMarginHz: m.modulusMarginHz, delayMarginS: m.delayMarginS, crossovers: m.crossovers, phaseCrossovers: m.phaseCrossovers, polesHz: m.closedLoopPolesHz },
		steps: detail.steps,
		sensitivity: detail.sensitivity
	};
}

/** Everything the review page shows (the report API answers it whole). */
export async function reviewView(db: Database, loop: Loop, owner: string) {
	const [record, drawing] = await Promise.all([reviewRecord(db, loop), reviewDrawing(loop, owner)]);
	return { ...record, ...drawing };
}

/** The sign-off report of a revision as a PDF, from its stored verdict (drawn in the analysis pool, for `owner`). */
export async function reportPdf(db: Database, loop: Loop, owner: string): Promise<Buffer | { error: { code: string; message: string; fields?: Record<string, string> } }> {
	const [{ rail, board }, history] = await Promise.all([context(db, loop), trail(db, loop)]);
	const railText = { name: rail?.name ?? 'rail', board: board?.name, notes: rail?.notes ?? undefined };
	const revision = { label: `r${loop.revision}`, author: loop.authorName ?? undefined, createdAt: loop.createdAt, status: loop.status };
	const review = history.map(({ at, who, action, note, freqHz }) => ({ at, who, action, note, freqHz }));
	// Everything the report prints besides the (immutable) design: a repeated download is the kept file.
	const switchingCheck = loop.switchingCheck ?? null;
	const key = exportKey({ pdf: loop.id, railText, revision, verification: loop.verification, review, switchingCheck });
	return cachedExport<Buffer, { error: { code: string; message: string; fields?: Record<string, string> } }>(key, async () => {
		const detail = await analyses.stored(owner, { design: loop.design, verification: loop.verification, sensitivity: true });
		if ('error' in detail) return detail;
		return buildSignoffPdf({
			sensitivity: detail.sensitivity,
			rail: railText,
			revision,
			document: detail.document,
			response: detail.response,
			verification: loop.verification,
			cornerTraces: detail.cornerTraces,
			switchingCheck,
			review
		});
	});
}
