// A board of the team's workspace with named buck rails (railBody) and, per rail, saved
// revisions r1, r2, … of buckDesign in the order given: the set-up the board, rail-screen and
// fit tests share. Made through the API as an engineer would (each save is verified there).
import { expect } from 'vitest';
import { buckDesign } from './designs';
import { railBody, type Team } from './fixtures';

export type Revision = Parameters<typeof buckDesign>[0] & { message?: string };

export interface SeededBoard {
	projectId: string;
	railIds: Record<string, string>;
	/** Per rail, the saved revisions oldest first. */
	saved: Record<string, { id: string; revision: number }[]>;
}

export async function boardWithRails(team: Team, boardName: string, rails: Record<string, Revision[]>): Promise<SeededBoard> {
	const { owner, engineer } = team.as;
	const board = await owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: boardName });
	expect(board.status, JSON.stringify(board.body)).toBe(201);
	const seeded: SeededBoard = { projectId: board.body.id, railIds: {}, saved: {} };
	for (const [name, revisions] of Object.entries(rails)) {
		const rail = await engineer.post(`/api/v1/projects/${seeded.projectId}/rails`, railBody(name));
		expect(rail.status, JSON.stringify(rail.body)).toBe(201);
		seeded.railIds[name] = rail.body.id;
		seeded.saved[name] = [];
		for (const { message, ...design } of revisions) {
			const base = seeded.saved[name].at(-1)?.revision ?? null;
			const reply = await engineer.post(`/api/v1/rails/${rail.body.id}/loops`, { baseRevision: base, design: buckDesign(design), message: message ?? `fc ${design.crossoverHz ?? 'as designed'}` });
			expect(reply.status, JSON.stringify(reply.body)).toBe(201);
			seeded.saved[name].push(reply.body);
		}
	}
	return seeded;
}
