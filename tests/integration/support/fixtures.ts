// A workspace with one member per role (plus an outsider in a second workspace), built
// through the public API where that is the behaviour under test and directly in the
// database where it is only set-up (adding members without the e-mail round trip).
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll } from 'vitest';
import { createDatabase } from '../../../src/lib/server/db';
import { member } from '../../../src/lib/server/db/schema';
import type { Role } from '../../../src/lib/authz';
import { servedApp } from './app';
import { signUp, type Client } from './client';

export type Member = Client & { email: string; userId: string };

export interface Team {
	workspaceId: string;
	as: Record<Role, Member>;
	/** Owner of another workspace; a stranger to this one. */
	outsider: Member;
	outsiderWorkspaceId: string;
}

export const testDb = () => createDatabase();

export async function createWorkspace(owner: Client, label: string): Promise<string> {
	const slug = `${label}-${randomUUID().slice(0, 8)}`;
	const reply = await owner.post('/api/v1/workspaces', { name: `Workspace ${label}`, slug });
	if (reply.status !== 201) throw new Error(`workspace create failed: ${reply.status} ${JSON.stringify(reply.body)}`);
	return reply.body.id;
}

export async function buildTeam(origin: string, db: ReturnType<typeof createDatabase>['db']): Promise<Team> {
	const [owner, engineer, reviewer, viewer, outsider] = await Promise.all(
		['owner', 'engineer', 'reviewer', 'viewer', 'outsider'].map((label) => signUp(origin, label))
	);
	const workspaceId = await createWorkspace(owner, 'team');
	const outsiderWorkspaceId = await createWorkspace(outsider, 'other');
	const now = new Date();
	await db.insert(member).values(
		([
			[engineer, 'engineer'],
			[reviewer, 'reviewer'],
			[viewer, 'viewer']
		] as const).map(([who, role]) => ({ id: randomUUID(), organizationId: workspaceId, userId: who.userId, role, createdAt: now }))
	);
	return { workspaceId, as: { owner, engineer, reviewer, viewer }, outsider, outsiderWorkspaceId };
}

export const railBody = (name = '5V0_MAIN') => ({
	name,
	topology: 'buck',
	vout: 5,
	vinNom: 12,
	vinMin: 9,
	vinMax: 16,
	ioutNom: 2,
	ioutMin: 0.2,
	ioutMax: 3,
	fsw: 500_000
});

export interface ServedTeam {
	origin: string;
	mailDir: string;
	db: ReturnType<typeof createDatabase>['db'];
	/** There once the file's tests run. */
	readonly team: Team;
}

/**
 * The set-up most integration files share: the served app, a team with one member per role made
 * before the file's tests, and the file's database pool, closed after them. Call it at the top
 * level of the file.
 */
export function servedTeam(): ServedTeam {
	const { origin, mailDir } = servedApp();
	const { db, pool } = testDb();
	let team: Team | undefined;
	beforeAll(async () => {
		team = await buildTeam(origin, db);
	});
	afterAll(async () => {
		await pool.end();
	});
	return {
		origin,
		mailDir,
		db,
		get team() {
			if (!team) throw new Error('servedTeam: read inside a test, after its beforeAll');
			return team;
		}
	};
}

