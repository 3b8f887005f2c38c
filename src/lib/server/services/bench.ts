// Bench data under a rail: an analyzer's CSV/TSV file parsed on upload (errors name the line
// and column), stored in canonical form (Hz, dB, unwrapped degrees) with its metadata, and
// its overlay on a loop revision: measured fc, PM and GM and the model-versus-measurement
// deviation up to fsw/2 (the averaged model's reach).
import { randomUUID } from 'node:crypto';
import { desc, eq } from 'drizzle-orm';
import type { Database } from '../db';
import { benchFile, user } from '../db/schema';
import { benchMetadataSchema, benchOverlay, parseBenchFile, sampledEvaluator, type BenchIssue } from '../../bench';
import { MAX_SWEEP_FSW_MULTIPLE, MAX_SWEEP_POINTS } from '../../engine/contract/designSchema';
import * as analyses from '../analysis-pool';
import { ApiError } from '../http/errors';
import { zodFields } from '../http/errors';
import * as audit from './audit';
import type { Rail } from './rails';
import * as loops from './loops';
import { fitProvenance, type FitRequest } from '../../engine/fit';
import type { BenchFitInput } from '../../schemas/signoff';
import type { Actor } from './types';

export type BenchFile = typeof benchFile.$inferSelect;

const listColumns = {
	id: benchFile.id,
	workspaceId: benchFile.workspaceId,
	railId: benchFile.railId,
	fileName: benchFile.fileName,
	kind: benchFile.kind,
	metadata: benchFile.metadata,
	format: benchFile.format,
	parseNotes: benchFile.parseNotes,
	points: benchFile.points,
	sizeBytes: benchFile.sizeBytes,
	uploadedBy: benchFile.uploadedBy,
	uploaderName: user.name,
	createdAt: benchFile.createdAt
};

/** "line 12, column 3 (Phase): not a number" */
export function issueText(i: BenchIssue): string {
	const where = [i.line !== null ? `line ${i.line}` : null, i.column !== null ? `column ${i.column}${i.columnName ? ` (${i.columnName})` : ''}` : null].filter(Boolean).join(', ');
	return where ? `${where}: ${i.message}` : i.message;
}

/**
 * Validates metadata and file, then stores them. Metadata problems are 400 with `metadata.<field>`;
 * file problems are 400 with `file` (the first problem) and `issues` (every problem with its
 * line and column, up to 20).
 */
export async function upload(db: Database, actor: Actor, owner: Rail, input: { fileName: string; text: string; sizeBytes: number; metadata: unknown }) {
	const meta = benchMetadataSchema.safeParse(input.metadata);
	if (!meta.success) throw new ApiError(400, 'invalid-metadata', 'the bench metadata failed validation', zodFields(meta.error, 'metadata'));
	const parsed = parseBenchFile(input.text, { phaseReference: meta.data.phaseReference });
	if (!parsed.ok) {
		const fields: Record<string, string> = { file: issueText(parsed.errors[0]) };
		throw new ApiError(400, 'invalid-bench-file', `the file could not be read: ${issueText(parsed.errors[0])}`, fields, { issues: parsed.errors });
	}
	const d = parsed.data;
	const row: BenchFile = {
		id: randomUUID(),
		workspaceId: owner.workspaceId,
		railId: owner.id,
		fileName: input.fileName.slice(0, 255),
		kind: meta.data.kind,
		metadata: meta.data as Record<string, unknown>,
		series: { freqHz: d.freqHz, magDb: d.magDb, phaseDeg: d.phaseDeg },
		format: d.format as unknown as Record<string, unknown>,
		parseNotes: d.notes,
		points: d.freqHz.length,
		sizeBytes: input.sizeBytes,
		uploadedBy: actor.userId,
		createdAt: new Date()
	};
	await db.transaction(async (tx) => {
		await tx.insert(benchFile).values(row);
		await audit.record(tx, {
			workspaceId: owner.workspaceId,
			actor,
			action: 'bench.upload',
			entityType: 'bench',
			entityId: row.id,
			after: { railId: owner.id, fileName: row.fileName, kind: row.kind, points: row.points }
		});
	});
	const { series: _s, ...summary } = row;
	return summary;
}

export function list(db: Database, railId: string) {
	return db.select(listColumns).from(benchFile).leftJoin(user, eq(user.id, benchFile.uploadedBy)).where(eq(benchFile.railId, railId)).orderBy(desc(benchFile.createdAt)).limit(200);
}

export async function get(db: Database, id: string): Promise<BenchFile | null> {
	const [row] = await db.select().from(benchFile).where(eq(benchFile.id, id)).limit(1);
	return row ?? null;
}

export async function remove(db: Database, actor: Actor, row: BenchFile) {
	await db.transaction(async (tx) => {
		await tx.delete(benchFile).where(eq(benchFile.id, row.id));
		await audit.record(tx, { workspaceId: row.workspaceId, actor, action: 'bench.delete', entityType: 'bench', entityId: row.id, before: { railId: row.railId, fileName: row.fileName } });
	});
}

/**
 * The model's frequencies for a measurement: the measured ones up to the sweep's ceiling
 * (10 × fsw; the deviation stops at fsw/2 anyway), evenly thinned to the sweep's point limit,
 * first and last kept. Between them the overlay interpolates in log f.
 */
export function modelFrequencies(measuredHz: readonly number[], fswHz: unknown): number[] {
	const ceiling = typeof fswHz === 'number' && fswHz > 0 ? MAX_SWEEP_FSW_MULTIPLE * fswHz : Infinity;
	const within = measuredHz.filter((f) => f <= ceiling);
	if (within.length <= MAX_SWEEP_POINTS) return within;
	const step = (within.length - 1) / (MAX_SWEEP_POINTS - 1);
	return Array.from({ length: MAX_SWEEP_POINTS }, (_, i) => within[Math.round(i * step)]);
}

/**
 * The file against a design: the model evaluated on the measured frequencies (the same trace
 * the file holds: loop gain or plant), measured margins, and the deviation clipped to fsw/2.
 * The model runs in the analysis pool for `owner`.
 */
export async function overlay(owner: string, row: BenchFile, design: unknown) {
	const s = row.series;
	const fsw = (design as { plant?: { fsw?: unknown } } | null)?.plant?.fsw;
	const sweep = { freqHz: modelFrequencies(s.freqHz, fsw) };
	const model = await analyses.analyze(owner, { ...(design as Record<string, unknown>), sweep }, { closedLoop: false, sections: false });
	if ('error' in model) return { model: null, modelError: model.error.message, metrics: null, deviation: null };
	const trace = row.kind === 'plant' ? model.response.plant : model.response.loop;
	const evaluate = sampledEvaluator({ freqHz: model.response.freqHz, magDb: trace.magDb, phaseDeg: trace.phaseDeg });
	const o = benchOverlay(s, evaluate, { kind: row.kind, fswHz: (design as { plant: { fsw: number } }).plant.fsw });
	return {
		model: { crossoverHz: model.metrics.crossoverHz, phaseMarginDeg: model.metrics.phaseMarginDeg, gainMarginDb: model.metrics.gainMarginDb },
		modelError: null,
		metrics: o.metrics,
		deviation: o.deviation.ok ? { ...o.deviation.deviation, perPoint: undefined } : null,
		deviationNote: o.deviation.ok ? null : o.deviation.message
	};
}

/**
 * Fits the parameters the request marks uncertain of a loop revision to this bench file (in the
 * analysis pool, for `actor`), at the measurement's Vin and Iout when its metadata gives them.
 * With `save`, the fitted document becomes the rail's next revision through the ordinary save
 * (verified like any design; 409 when the fitted revision is no longer the latest); its message
 * and audit entry say which file, which parameters and the residual before and after.
 */
export async function fit(
	db: Database,
	actor: Actor,
	owner: Rail,
	row: BenchFile,
	loop: { id: string; revision: number; design: unknown },
	input: BenchFitInput
) {
	const { loopId: _l, save, message, ...request } = input;
	const meta = row.metadata as { vin?: number; iout?: number };
	const answer = await analyses.fit(actor.userId, {
		document: loop.design,
		measurement: row.series,
		request: request satisfies FitRequest,
		measuredKind: row.kind,
		vin: typeof meta.vin === 'number' ? meta.vin : undefined,
		iout: typeof meta.iout === 'number' ? meta.iout : undefined
	});
	if ('error' in answer) {
		const status = answer.error.code === 'invalid-fit' ? 400 : 422;
		throw new ApiError(status, answer.error.code, answer.error.message, answer.error.fields);
	}
	let saved: { id: string; revision: number } | null = null;
	if (save) {
		const provenance = fitProvenance(answer.fit, row.fileName);
		const revision = await loops.save(db, actor, owner, { baseRevision: loop.revision, design: answer.document, message: message ?? provenance });
		await audit.record(db, {
			workspaceId: owner.workspaceId,
			actor,
			action: 'loop.fit',
			entityType: 'loop',
			entityId: revision.id,
			after: {
				railId: owner.id,
				revision: revision.revision,
				fittedFrom: { loopId: loop.id, revision: loop.revision },
				benchFile: { id: row.id, fileName: row.fileName },
				parameters: answer.fit.parameters.map((p) => ({ path: p.path, typed: p.typed, fitted: p.fitted, interval: p.interval })),
				residual: answer.fit.residual,
				provenance
			}
		});
		saved = { id: revision.id, revision: revision.revision };
	}
	return { fit: answer.fit, document: answer.document, against: { loopId: loop.id, revision: loop.revision }, saved };
}
