// The sign-off view of one loop revision, assembled for the review page, the exports and the
// PDF report: its rail, board and margin targets in force, the engine's analysis at every
// corner, the review trail (requests, comments, decisions from the audit log), the differences
// to the rail's last approved revision, and the report itself.
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { Database } from '../db';
import { auditLog, project, user } from '../db/schema';
import { buildSignoffPdf, type ReviewEntry } from '../exports';
import * as loops from './loops';
import * as rails from './rails';
import * as reviews from './reviews';
import * as workspaces from './workspaces';
import { analyzeRevision, judge, parameterDiff, spreadSummary, stepResponses } from './loop-analysis';

export type Loop = NonNullable<Awaited<ReturnType<typeof loops.get>>>;

export async function context(db: Database, loop: Loop) {
	const rail = await rails.get(db, loop.railId);
	const [board] = rail ? await db.select({ id: project.id, name: project.name }).from(project).where(eq(project.id, rail.projectId)).limit(1) : [];
	const targets = rail?.marginTargets ?? (await workspaces.marginTargets(db, loop.workspaceId));
	return { rail, board: board ?? null, targets };
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

/** Everything the review page shows, computed on the server. */
export async function reviewView(db: Database, loop: Loop) {
	const { rail, board, targets } = await context(db, loop);
	const analysis = analyzeRevision(loop.design, rail);
	const base = rail ? await reviews.lastApproved(db, rail.id, loop.revision) : null;
	const [comments, requests, history] = await Promise.all([loops.comments(db, loop.id), reviews.requestsFor(db, loop.id), trail(db, loop)]);
	const common = {
		loop: { id: loop.id, revision: loop.revision, status: loop.status, message: loop.message, authorId: loop.authorId, authorName: loop.authorName, createdAt: loop.createdAt, templateId: loop.templateId },
		rail: rail ? { id: rail.id, name: rail.name, projectId: rail.projectId, topology: rail.topology, fsw: rail.fsw, vout: rail.vout } : null,
		board,
		targets,
		comments,
		requests,
		trail: history,
		diff: base ? { baseRevision: base.revision, baseId: base.id, changes: parameterDiff(base.design, loop.design) } : null
	};
	if ('error' in analysis) return { ...common, analysisError: analysis.error, corners: [], nominal: null, steps: null, spread: null };
	const fsw = analysis.document.plant.fsw;
	const m = analysis.nominal.metrics;
	const nominalRow = { label: 'As designed', vin: analysis.document.plant.vin, iout: analysis.document.plant.iout, crossoverHz: m.crossoverHz, phaseMarginDeg: m.phaseMarginDeg, gainMarginDb: m.gainMarginDb, closedLoopStable: m.closedLoopStable };
	const cornerRows = analysis.corners.map((c) => ({
		label: c.label,
		vin: c.vin,
		iout: c.iout,
		crossoverHz: c.response.metrics.crossoverHz,
		phaseMarginDeg: c.response.metrics.phaseMarginDeg,
		gainMarginDb: c.response.metrics.gainMarginDb,
		closedLoopStable: c.response.metrics.closedLoopStable
	}));
	return {
		...common,
		analysisError: null,
		nominal: { ...nominalRow, verdict: judge(nominalRow, targets, fsw), warnings: analysis.nominal.warnings.map((w) => w.message) },
		corners: [
			...cornerRows.map((c) => ({ ...c, verdict: judge(c, targets, fsw), error: null as string | null })),
			...analysis.refused.map((r) => ({ label: r.label, vin: null, iout: null, crossoverHz: null, phaseMarginDeg: null, gainMarginDb: null, closedLoopStable: null, verdict: { status: 'fail' as const, reason: r.message }, error: r.message }))
		],
		steps: stepResponses(analysis.detail),
		spread: rail ? spreadSummary(analysis.detail, rail.tolerances, targets) : null
	};
}

/** The sign-off report of a revision as a PDF. */
export async function reportPdf(db: Database, loop: Loop): Promise<Buffer | { error: { code: string; message: string; fields?: Record<string, string> } }> {
	const { rail, board, targets } = await context(db, loop);
	const analysis = analyzeRevision(loop.design, rail);
	if ('error' in analysis) return analysis;
	const fsw = analysis.document.plant.fsw;
	return buildSignoffPdf({
		rail: { name: rail?.name ?? 'rail', board: board?.name, notes: rail?.notes ?? undefined },
		revision: { label: `r${loop.revision}`, author: loop.authorName ?? undefined, createdAt: loop.createdAt, status: loop.status },
		document: analysis.document,
		response: analysis.nominal,
		corners: analysis.corners.map((c) => ({ label: c.label, vin: c.vin, iout: c.iout, response: c.response, verdict: judge(c.response.metrics, targets, fsw) })),
		targets: { phaseMarginDeg: targets.phaseMarginDeg, gainMarginDb: targets.gainMarginDb },
		review: (await trail(db, loop)).map(({ at, who, action, note, freqHz }) => ({ at, who, action, note, freqHz }))
	});
}
