// Boards for the integration tests, made through the API as an engineer would (each save is
// verified there): `teamWithBoard`, the served app with a team and one empty board that a test
// file fills with its own rails; `boardWithRails`, a board with named buck rails (railBody) and,
// per rail, saved revisions r1, r2, … of buckDesign in the order given.
import { randomUUID } from 'node:crypto';
import { beforeAll, expect } from 'vitest';
import type { Client } from './client';
import { buckDesign } from './designs';
import { railBody, servedTeam, type ServedTeam, type Team } from './fixtures';

export type Revision = Parameters<typeof buckDesign>[0] & { message?: string };

/** What a save answers, the part the tests read. */
export interface SavedRevision {
	id: string;
	revision: number;
	verification: { status: string; engineVersion: string; rows: { metric: string; status: string }[] } & Record<string, any>;
}

export interface SeededBoard {
	projectId: string;
	railIds: Record<string, string>;
	/** Per rail, the saved revisions oldest first. */
	saved: Record<string, SavedRevision[]>;
}

/** A new board of the team's workspace, made by its owner. */
async function newBoard(team: Team, name: string): Promise<string> {
	const board = await team.as.owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name });
	expect(board.status, JSON.stringify(board.body)).toBe(201);
	return board.body.id;
}

/** A rail (railBody with `overrides`) on a board. */
export async function addRail(who: Client, projectId: string, name: string, overrides: Record<string, unknown> = {}): Promise<{ id: string; name: string }> {
	const rail = await who.post(`/api/v1/projects/${projectId}/rails`, { ...railBody(name), ...overrides });
	expect(rail.status, JSON.stringify(rail.body)).toBe(201);
	return rail.body;
}

/** A revision of a rail, saved on `baseRevision` (null: the first). */
export async function saveRevision(who: Client, railId: string, design: unknown, baseRevision: number | null, message: string): Promise<SavedRevision> {
	const reply = await who.post(`/api/v1/rails/${railId}/loops`, { baseRevision, design, message });
	expect(reply.status, JSON.stringify(reply.body)).toBe(201);
	return reply.body;
}

export async function boardWithRails(team: Team, boardName: string, rails: Record<string, Revision[]>): Promise<SeededBoard> {
	const { engineer } = team.as;
	const seeded: SeededBoard = { projectId: await newBoard(team, boardName), railIds: {}, saved: {} };
	for (const [name, revisions] of Object.entries(rails)) {
		const rail = await addRail(engineer, seeded.projectId, name);
		seeded.railIds[name] = rail.id;
		seeded.saved[name] = [];
		for (const { message, ...design } of revisions) {
			const base = seeded.saved[name].at(-1)?.revision ?? null;
			seeded.saved[name].push(await saveRevision(engineer, rail.id, buckDesign(design), base, message ?? `fc ${design.crossoverHz ?? 'as designed'}`));
		}
	}
	return seeded;
}

export interface TeamBoard extends ServedTeam {
	/** The board: there once the file's tests run. */
	readonly projectId: string;
	/** A new rail on the board, made by the owner and named `${prefix}_${n}_XXXX` (unique per run). */
	newRail(prefix: string, overrides?: Record<string, unknown>): Promise<{ id: string; name: string }>;
	/** A revision saved by the engineer. */
	save(railId: string, design: unknown, options?: { base?: number | null; message?: string }): Promise<SavedRevision>;
}

/**
 * The set-up of a test file whose tests make their own rails: servedTeam's app, team and
 * database, and one board made before the file's tests. Call it at the top level of the file.
 */
export function teamWithBoard(boardName: string): TeamBoard {
	const served = servedTeam();
	let projectId: string | undefined;
	let rails = 0;
	const ready = <T>(value: T | undefined): T => {
		if (value === undefined) throw new Error('teamWithBoard: read inside a test, after its beforeAll');
		return value;
	};
	beforeAll(async () => {
		projectId = await newBoard(served.team, boardName);
	});
	return {
		origin: served.origin,
		mailDir: served.mailDir,
		db: served.db,
		get team() {
			return served.team;
		},
		get projectId() {
			return ready(projectId);
		},
		newRail: (prefix, overrides = {}) => addRail(served.team.as.owner, ready(projectId), `${prefix}_${++rails}_${randomUUID().slice(0, 4).toUpperCase()}`, overrides),
		save: (railId, design, { base = null, message = 'saved' } = {}) => saveRevision(served.team.as.engineer, railId, design, base, message)
	};
}
