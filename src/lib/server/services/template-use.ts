// Templates in use: a loop's compensator strategy turned into a template that scales with the
// plant (crossover as a fraction of fsw, zeros as multiples of the LC resonance f0, poles as
// fractions of fsw), applied to another rail by re-placing the network on that rail's power
// stage with the engine, and the rails whose latest revision came from a template.
import { and, desc, eq, inArray, max } from 'drizzle-orm';
import type { z } from 'zod';
import type { Database } from '../db';
import { loopRevision, rail } from '../db/schema';
import type { AnalysisResponse } from '../../engine/contract/responseSchema';
import type { DesignDocument } from '../../engine/contract/designSchema';
import type { Verification } from '../../engine/verify/types';
import { readForm, starterForm } from '../../design/form';
import { defaultCrossoverHz } from '../../engine/compensators/crossoverLimit';
import { CONTROL_MODE_LABEL, controlOf, templateControlMismatch } from '../../text/controlMode';
import type { templateSchema } from '../../schemas/workspace';
import * as analyses from '../analysis-pool';
import { ApiError } from '../http/errors';
import * as loops from './loops';
import { completeSpec } from './rail-spec';
import * as verdicts from './verdicts';
import { verifyDocument } from './verify';
import type { Rail } from './rails';
import type { Template } from './templates';
import type { Actor } from './types';

type Strategy = z.infer<typeof templateSchema>['compensator'];

/** Significant digits kept in stored ratios: enough to reproduce a placement, no float noise. */
const sig = (x: number) => Number(x.toPrecision(4));

/**
 * The strategy of an analysed design. K-factor keeps its method (K follows from the target
 * phase margin); features, manual placements and hand-entered parts become "features" with the
 * built network's zeros relative to f0 and poles relative to fsw, so another plant gets the
 * same shape around its own resonance.
 */
export function strategyFromDesign(doc: DesignDocument, response: AnalysisResponse): Strategy {
	const c = doc.compensator;
	const fsw = doc.plant.fsw;
	const fc = c.target?.crossoverHz ?? response.metrics.crossoverHz ?? fsw / 10;
	const series = c.series === null ? { resistors: null, capacitors: null } : (c.series ?? { resistors: 'E96' as const, capacitors: 'E12' as const });
	const crossoverFraction = sig(Math.min(0.5, fc / fsw));
	// The network answers the plant of its control method, so the strategy records it.
	const control = controlOf(doc.modulator.control);
	if (c.target?.method === 'k-factor' && !c.parts) {
		return { kind: c.kind, control, target: { method: 'k-factor', crossoverFraction, phaseMarginDeg: c.target.phaseMarginDeg ?? 60 }, series };
	}
	const net = response.compensator.rounded ?? response.compensator.ideal;
	const f0 = response.features.f0Hz;
	const zeros = net.zerosHz.filter((f) => f > 0);
	const poles = net.polesHz.filter((f) => f > 0);
	return {
		kind: c.kind,
		control,
		target: {
			method: 'features',
			crossoverFraction,
			...(zeros.length ? { zerosRelF0: zeros.slice(0, 2).map((z) => sig(z / f0)) } : {}),
			...(poles.length ? { polesRelFsw: poles.slice(0, 2).map((p) => sig(p / fsw)) } : {})
		},
		series
	};
}

/** The base design of a rail: its latest revision, else the starter design of the design screen. */
export async function railBaseDesign(db: Database, r: Rail): Promise<{ design: Record<string, unknown>; revision: number | null }> {
	const [latest] = await db.select().from(loopRevision).where(eq(loopRevision.railId, r.id)).orderBy(desc(loopRevision.revision)).limit(1);
	if (latest) return { design: latest.design, revision: latest.revision };
	const starter = readForm(starterForm(r)).document;
	if (!starter) throw new ApiError(422, 'no-base-design', `rail ${r.name} has no loop and no starter design could be made from its values`);
	return { design: starter as unknown as Record<string, unknown>, revision: null };
}

/** The design with the template's strategy placed on its plant (numbers from the strategy × this plant). */
export function designWithStrategy(base: Record<string, unknown>, strategy: Strategy): Record<string, unknown> {
	const plant = base.plant as { fsw: number };
	const old = (base.compensator ?? {}) as { opamp?: unknown };
	const t = strategy.target;
	// A strategy without a crossover (the demo's "below the RHP zero") takes the placement's own
	// rule on this plant: fsw/10 under the fsw limit and a fifth of the worst RHP zero.
	const crossoverHz = t?.crossoverFraction ? t.crossoverFraction * plant.fsw : (t?.crossoverHz ?? (t && t.method !== 'manual' ? defaultCrossoverHz(base as never) : undefined));
	const target = t
		? {
				method: t.method === 'manual' ? 'features' : t.method,
				...(crossoverHz ? { crossoverHz } : {}),
				...(t.phaseMarginDeg !== undefined ? { phaseMarginDeg: t.phaseMarginDeg } : {}),
				...(t.zerosRelF0 ? { zerosRelF0: t.zerosRelF0 } : {}),
				...(t.polesRelFsw ? { polesRelFsw: t.polesRelFsw } : {})
			}
		: { method: 'k-factor', crossoverHz: plant.fsw / 10, phaseMarginDeg: 60 };
	return {
		...base,
		compensator: { kind: strategy.kind, target, series: strategy.series ?? { resistors: 'E96', capacitors: 'E12' }, ...(old.opamp ? { opamp: old.opamp } : {}) }
	};
}

/**
 * Applies `tpl` to `target`: the network re-placed on the rail's plant, its verdict against the
 * rail's spec (the same verification a save stores), and (with `save`) a new revision that
 * records the template.
 */
export async function apply(db: Database, actor: Actor, tpl: Template, target: Rail, options: { save: boolean; message?: string }) {
	if (tpl.topology && tpl.topology !== target.topology) {
		throw new ApiError(422, 'topology-mismatch', `the template is for a ${tpl.topology}; ${target.name} is a ${target.topology}`, { railId: `must be a ${tpl.topology} rail` });
	}
	const base = await railBaseDesign(db, target);
	const strategy = tpl.compensator as Strategy;
	const railControl = (base.design.modulator as { control?: string } | undefined)?.control;
	const mismatch = templateControlMismatch(strategy.control, railControl, target.name);
	if (mismatch) {
		const wanted = CONTROL_MODE_LABEL[controlOf(strategy.control)].toLowerCase();
		throw new ApiError(422, 'control-mismatch', mismatch, { railId: `must be a ${wanted} rail` });
	}
	const design = designWithStrategy(base.design, strategy);
	const analysis = await analyses.analyze(actor.userId, design, { includeResponse: false, closedLoop: false, sections: false });
	if ('error' in analysis) {
		throw new ApiError(422, 'template-not-placeable', `the template cannot be placed on ${target.name}: ${analysis.error.message}`, analysis.error.fields);
	}
	const net = analysis.compensator.rounded ?? analysis.compensator.ideal;
	const result = {
		rail: { id: target.id, name: target.name },
		baseRevision: base.revision,
		design,
		parts: net.parts,
		zerosHz: net.zerosHz,
		polesHz: net.polesHz,
		metrics: {
			crossoverHz: analysis.metrics.crossoverHz,
			phaseMarginDeg: analysis.metrics.phaseMarginDeg,
			gainMarginDb: analysis.metrics.gainMarginDb,
			closedLoopStable: analysis.metrics.closedLoopStable
		},
		verification: null as Verification | null,
		warnings: analysis.warnings.map((w) => w.message),
		saved: null as null | { id: string; revision: number }
	};
	if (options.save) {
		const row = await loops.save(db, actor, target, {
			baseRevision: base.revision,
			design,
			message: options.message ?? `Network from template "${tpl.name}"`,
			templateId: tpl.id
		});
		result.saved = { id: row.id, revision: row.revision };
		result.verification = row.verification;
	} else {
		const v = await verifyDocument(await completeSpec(db, target, design), actor.userId);
		result.verification = 'error' in v ? null : v;
	}
	return result;
}

/** After `tpl` changed: re-verify every rail that uses it with the new strategy, flagging changed verdicts. */
export async function reverifyUsers(db: Database, tpl: Template) {
	const users = (await usage(db, tpl.workspaceId, [tpl.id]))[tpl.id] ?? [];
	return verdicts.afterTemplateChange(db, tpl, users, (base) => designWithStrategy(base, tpl.compensator as Strategy));
}

/** Rails of the workspace whose latest revision was placed from a template, by template id. */
export async function usage(db: Database, workspaceId: string, templateIds?: string[]) {
	const latest = db
		.select({ railId: loopRevision.railId, latest: max(loopRevision.revision).as('latest') })
		.from(loopRevision)
		.where(eq(loopRevision.workspaceId, workspaceId))
		.groupBy(loopRevision.railId)
		.as('latest');
	const rows = await db
		.select({ templateId: loopRevision.templateId, railId: rail.id, railName: rail.name, projectId: rail.projectId, revision: loopRevision.revision, status: loopRevision.status })
		.from(loopRevision)
		.innerJoin(latest, and(eq(latest.railId, loopRevision.railId), eq(latest.latest, loopRevision.revision)))
		.innerJoin(rail, eq(rail.id, loopRevision.railId))
		.where(templateIds?.length ? inArray(loopRevision.templateId, templateIds) : eq(loopRevision.workspaceId, workspaceId));
	const by: Record<string, { railId: string; railName: string; projectId: string; revision: number; status: string }[]> = {};
	for (const r of rows) if (r.templateId) (by[r.templateId] ??= []).push({ railId: r.railId, railName: r.railName, projectId: r.projectId, revision: r.revision, status: r.status });
	return by;
}

