// Stored verdicts over time, against MariaDB: rows saved before verdicts existed get their
// rail's spec and a verdict (the migration's data step), a verdict from another engine version
// is re-verified and a changed one flags the rail (shown by the API, cleared by acknowledging
// or by a new revision), and a template change re-verifies the rails that use it.
import './support/env';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { loopRevision } from '../../src/lib/server/db/schema';
import { olderChecks } from '../../src/lib/server/services/switching-check';
import { reverify } from '../../src/lib/server/services/verdicts';
import { ENGINE_VERSION } from '../../src/lib/engine/version';
import { teamWithBoard } from './support/board';
import { buckDesign } from './support/designs';

const board = teamWithBoard('Verdict board');
const { db } = board;
const newRail = async () => (await board.newRail('VD')).id;
const save = (railId: string, base: number | null, design: unknown = buckDesign(), message = 'cut') => board.save(railId, design, { base, message });

describe('re-verification', () => {
	it('fills a row saved before verdicts were stored: the rail’s spec sections, then the verdict', async () => {
		const railId = await newRail();
		const id = randomUUID();
		await db.insert(loopRevision).values({ id, workspaceId: board.team.workspaceId, railId, revision: 1, schemaVersion: 1, design: buckDesign(), message: 'legacy', status: 'approved', authorId: board.team.as.engineer.userId, createdAt: new Date() });
		const entries = await reverify(db);
		const mine = entries.find((e) => e.railId === railId)!;
		expect(mine).toMatchObject({ revision: 1, before: null, specFilled: true, flagged: false, error: null });
		const [row] = await db.select().from(loopRevision).where(eq(loopRevision.id, id));
		expect(row.design.corners).toEqual({ vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } });
		expect(row.design.targets).toEqual({ phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 });
		expect(row.engineVersion).toBe(ENGINE_VERSION);
		expect(row.verification!.status).toBe(mine.after!.status);
		// A second run finds nothing stale.
		expect((await reverify(db)).find((e) => e.railId === railId)).toBeUndefined();
	});

	it('after an engine change, a latest revision whose verdict changed flags its rail; acknowledging or saving clears it', async () => {
		const railId = await newRail();
		const r1 = await save(railId, null);
		// What an older engine stored: another version and the opposite status.
		const old = { ...r1.verification, engineVersion: 'old', status: r1.verification.status === 'fail' ? 'pass' : 'fail' };
		await db.update(loopRevision).set({ verification: old as never, engineVersion: 'old' }).where(eq(loopRevision.id, r1.id));
		const entry = (await reverify(db)).find((e) => e.railId === railId)!;
		expect(entry).toMatchObject({ flagged: true, before: { status: old.status, engineVersion: 'old' }, after: { status: r1.verification.status, engineVersion: ENGINE_VERSION } });
		const rail = (await board.team.as.viewer.get(`/api/v1/rails/${railId}`)).body;
		expect(rail.verdictFlag).toMatchObject({ cause: 'engine', revision: 1, before: { status: old.status }, after: { status: r1.verification.status } });
		// A viewer may not clear it; an engineer may.
		expect((await board.team.as.viewer.delete(`/api/v1/rails/${railId}/verdict-flag`)).status).toBe(403);
		const cleared = await board.team.as.engineer.delete(`/api/v1/rails/${railId}/verdict-flag`);
		expect(cleared.status).toBe(200);
		expect(cleared.body.verdictFlag).toBeNull();

		// Flag again, then a new revision clears it: the new revision has a verdict of its own.
		await db.update(loopRevision).set({ verification: old as never, engineVersion: 'old' }).where(eq(loopRevision.id, r1.id));
		await reverify(db);
		expect((await board.team.as.viewer.get(`/api/v1/rails/${railId}`)).body.verdictFlag).not.toBeNull();
		await save(railId, 1);
		expect((await board.team.as.viewer.get(`/api/v1/rails/${railId}`)).body.verdictFlag).toBeNull();
	});

	it('an unchanged verdict and an older revision never flag', async () => {
		const railId = await newRail();
		const r1 = await save(railId, null);
		await save(railId, 1, buckDesign({ crossoverHz: 30_000 }));
		// r1 is no longer the latest: its changed verdict is re-stored but the rail is not flagged.
		await db.update(loopRevision).set({ verification: { ...r1.verification, status: r1.verification.status === 'fail' ? 'pass' : 'fail' } as never, engineVersion: 'old' }).where(eq(loopRevision.id, r1.id));
		const entries = (await reverify(db)).filter((e) => e.railId === railId);
		expect(entries).toHaveLength(1);
		expect(entries[0]).toMatchObject({ revision: 1, flagged: false });
		expect((await board.team.as.viewer.get(`/api/v1/rails/${railId}`)).body.verdictFlag).toBeNull();
	});
});

describe('template change', () => {
	it('re-verifies every rail using the template with the new strategy and flags the ones whose verdict changes', async () => {
		const railId = await newRail();
		await save(railId, null);
		const tpl = await board.team.as.engineer.post(`/api/v1/templates?workspace=${board.team.workspaceId}`, {
			name: `fsw/12.5 ${randomUUID().slice(0, 6)}`,
			topology: 'buck',
			compensator: { kind: 'type3', target: { method: 'k-factor', crossoverFraction: 0.08, phaseMarginDeg: 60 }, series: { resistors: 'E96', capacitors: 'E12' } }
		});
		expect(tpl.status, JSON.stringify(tpl.body)).toBe(201);
		const applied = await board.team.as.engineer.post(`/api/v1/templates/${tpl.body.id}/apply`, { railId, save: true });
		expect(applied.status, JSON.stringify(applied.body)).toBe(201);
		const stored = (await board.team.as.viewer.get(`/api/v1/loops/${applied.body.saved.id}`)).body.verification;
		expect(stored.rows.find((r: { metric: string }) => r.metric === 'fc').status).toBe('pass');

		// A renamed template changes no network: nothing to re-verify.
		const renamed = await board.team.as.engineer.patch(`/api/v1/templates/${tpl.body.id}`, { name: `${tpl.body.name} (renamed)`, baseUpdatedAt: tpl.body.updatedAt });
		expect(renamed.body.reverified).toEqual([]);

		// Crossover at 0.45 × fsw: above the 0.2 × fsw target [common practice: fc ≤ fsw/5], so the fc row cannot stay pass.
		const changed = await board.team.as.engineer.patch(`/api/v1/templates/${tpl.body.id}`, {
			baseUpdatedAt: renamed.body.updatedAt,
			compensator: { kind: 'type3', target: { method: 'k-factor', crossoverFraction: 0.45, phaseMarginDeg: 60 }, series: { resistors: 'E96', capacitors: 'E12' } }
		});
		expect(changed.status, JSON.stringify(changed.body)).toBe(200);
		expect(changed.body.reverified).toEqual([expect.objectContaining({ railId, revision: 2, flagged: true })]);
		const rail = (await board.team.as.viewer.get(`/api/v1/rails/${railId}`)).body;
		expect(rail.verdictFlag).toMatchObject({ cause: 'template', revision: 2, template: { id: tpl.body.id } });
		expect(rail.verdictFlag.after.rows.fc).not.toBe('pass');
		// The stored revision itself is untouched: adopting the change is a new revision.
		expect((await board.team.as.viewer.get(`/api/v1/loops/${applied.body.saved.id}`)).body.verification).toEqual(stored);
	});
});

describe('kept switching checks of an older engine', () => {
	it('are listed by rail and revision, with the engine they came from; a current one is not', async () => {
		const railId = await newRail();
		const r1 = await save(railId, null);
		const r2 = await save(railId, 1);
		const kept = (engineVersion: string) => ({ engineVersion, computedAt: new Date().toISOString(), requestedBy: board.team.as.engineer.userId, freqHz: null, result: {} }) as never;
		await db.update(loopRevision).set({ switchingCheck: kept('old') }).where(eq(loopRevision.id, r1.id));
		await db.update(loopRevision).set({ switchingCheck: kept(ENGINE_VERSION) }).where(eq(loopRevision.id, r2.id));
		const railName = (await board.team.as.viewer.get(`/api/v1/rails/${railId}`)).body.name;
		const mine = (await olderChecks(db)).filter((c) => c.railName === railName);
		expect(mine).toEqual([{ railName, revision: 1, engineVersion: 'old' }]);
	});
});

