// Demo seed: an invented company (Kestrel Fieldworks, industrial sensor gateways) with one
// workspace, a demo user per role, two boards, six rails of both topologies, loops in every
// review status (one review pending) and two templates. Runs once per database (seed_mark
// row 'demo-v1'); every step also finds before it creates, so a half-finished run can resume.
// Run: npx tsx scripts/seed.ts   (npm start runs it; DB_* settings as in scripts/env.sh)
// With --scale it also makes the "Scale test" workspace (200 rails × 20 revisions, ./seed-scale.ts).

import { DEMO_PASSWORD, DEMO_USERS } from './demo-users';

import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { createAuth } from '../src/lib/server/auth-core';
import { db, pool } from '../src/lib/server/db';
import { benchFile, member, organization, project, rail as railTable, seedMark, template, user } from '../src/lib/server/db/schema';
import * as loops from '../src/lib/server/services/loops';
import * as projects from '../src/lib/server/services/projects';
import * as rails from '../src/lib/server/services/rails';
import * as templates from '../src/lib/server/services/templates';
import * as workspaces from '../src/lib/server/services/workspaces';
import { gateway, sensorNode, type RailSeed } from './demo-rails';
import { DEMO_BENCH, demoBenchText } from './demo-bench';
import * as bench from '../src/lib/server/services/bench';
import { seedScale } from './seed-scale';
import { spreadDemoHistory } from './demo-history';

const MARK = 'demo-v1';
const WORKSPACE = { name: 'Kestrel Fieldworks', slug: 'kestrel-fieldworks' };

async function findOrCreateUser(auth: ReturnType<typeof createAuth>, u: (typeof DEMO_USERS)[number]) {
	const [found] = await db.select().from(user).where(eq(user.email, u.email)).limit(1);
	if (found) return found;
	const created = await auth.api.signUpEmail({ body: { email: u.email, password: DEMO_PASSWORD, name: u.name } });
	// Demo addresses cannot receive mail; treat them as verified.
	await db.update(user).set({ emailVerified: true }).where(eq(user.id, created.user.id));
	return created.user;
}

async function seedBoard(
	workspaceId: string,
	people: { engineer: { userId: string; email: string }; reviewer: { userId: string; email: string } },
	board: { name: string; description: string },
	seeds: RailSeed[]
) {
	const existing = (await projects.list(db, workspaceId, { limit: 200, offset: 0 })).items.find((p) => p.name === board.name);
	const project = existing ?? (await projects.create(db, people.engineer, workspaceId, board));
	for (const seed of seeds) {
		const [found] = await db.select().from(railTable).where(eq(railTable.projectId, project.id)).then((rows) => rows.filter((r) => r.name === seed.rail.name));
		const rail = found ?? (await rails.create(db, people.engineer, project, seed.rail));
		const have = (await rails.latestRevision(db, rail.id)) ?? 0;
		for (const [index, rev] of seed.revisions.entries()) {
			if (index < have) continue;
			const saved = await loops.save(db, people.engineer, rail, { baseRevision: index, design: rev.design, message: rev.message });
			let current: Parameters<typeof loops.review>[2] = saved;
			if (rev.status !== 'draft') current = await loops.review(db, people.engineer, current, 'request-review');
			if (rev.status === 'approved') current = await loops.review(db, people.reviewer, current, 'approve', rev.note);
			if (rev.status === 'changes-requested') current = await loops.review(db, people.reviewer, current, 'request-changes', rev.note);
		}
	}
}

async function demoPeople() {
	const auth = createAuth(db);
	const people = new Map<string, { userId: string; email: string }>();
	for (const u of DEMO_USERS) {
		const row = await findOrCreateUser(auth, u);
		people.set(u.role, { userId: row.id, email: row.email });
	}
	return people;
}

async function main() {
	const [done] = await db.select().from(seedMark).where(eq(seedMark.name, MARK)).limit(1);
	if (done) {
		console.log(`[seed] demo data already present (seeded ${done.appliedAt.toISOString()})`);
		return;
	}
	const people = await demoPeople();
	const owner = people.get('owner')!;

	const [existingWorkspace] = await db.select().from(organization).where(eq(organization.slug, WORKSPACE.slug)).limit(1);
	const workspace = existingWorkspace ?? (await workspaces.create(db, owner, WORKSPACE));
	const roster = await workspaces.members(db, workspace.id);
	for (const u of DEMO_USERS) {
		const who = people.get(u.role)!;
		if (roster.some((m) => m.userId === who.userId)) continue;
		await db.insert(member).values({ id: randomUUID(), organizationId: workspace.id, userId: who.userId, role: u.role, createdAt: new Date() });
	}

	const team = { engineer: people.get('engineer')!, reviewer: people.get('reviewer')! };
	await seedBoard(workspace.id, team, { name: 'KF-210 Gateway main board', description: '24 V field-bus gateway: 5 V, 3.3 V I/O and the SoC core.' }, gateway);
	await seedBoard(workspace.id, team, { name: 'KF-88 Sensor node', description: 'Battery sensor node on one Li-ion cell (3.0–4.2 V).' }, sensorNode);

	const have = new Set((await db.select({ name: template.name }).from(template).where(eq(template.workspaceId, workspace.id))).map((t) => t.name));
	const templateSeeds = [
		{
			name: 'Buck Type III, fsw/10',
			description: 'Our default for ceramic-output bucks: K-factor placement, crossover a tenth of fsw, 60° phase margin, E96 resistors and E12 capacitors.',
			topology: 'buck' as const,
			compensator: { kind: 'type3' as const, target: { method: 'k-factor' as const, crossoverFraction: 0.1, phaseMarginDeg: 60 }, series: { resistors: 'E96' as const, capacitors: 'E12' as const } }
		},
		{
			name: 'Boost Type III below the RHP zero',
			description: 'Crossover at most a fifth of the worst-case RHP zero (lowest Vin, highest load), 55° phase margin.',
			topology: 'boost' as const,
			compensator: { kind: 'type3' as const, target: { method: 'k-factor' as const, phaseMarginDeg: 55 }, series: { resistors: 'E96' as const, capacitors: 'E12' as const } }
		}
	];
	for (const t of templateSeeds) if (!have.has(t.name)) await templates.create(db, owner, workspace.id, t);

	await db.insert(seedMark).values({ name: MARK, appliedAt: new Date() });
	console.log(`[seed] demo workspace "${WORKSPACE.name}" ready; sign in with any of (password ${DEMO_PASSWORD}):`);
	for (const u of DEMO_USERS) console.log(`[seed]   ${u.role.padEnd(8)} ${u.email}`);
}

/**
 * The demo rail's bench file (scripts/demo-bench.ts, invented data with one parasitic off), for
 * the fit walk-through. Its own mark, so a database seeded before the file existed gets it too.
 */
async function demoBench() {
	const mark = 'demo-bench-v1';
	const [done] = await db.select().from(seedMark).where(eq(seedMark.name, mark)).limit(1);
	if (done) return;
	const [found] = await db
		.select({ rail: railTable })
		.from(railTable)
		.innerJoin(project, eq(project.id, railTable.projectId))
		.innerJoin(organization, eq(organization.id, railTable.workspaceId))
		.where(and(eq(organization.slug, WORKSPACE.slug), eq(project.name, DEMO_BENCH.board), eq(railTable.name, DEMO_BENCH.rail)))
		.limit(1);
	if (!found) return;
	const have = await db.select({ id: benchFile.id }).from(benchFile).where(and(eq(benchFile.railId, found.rail.id), eq(benchFile.fileName, DEMO_BENCH.fileName))).limit(1);
	if (!have.length) {
		const engineer = (await demoPeople()).get('engineer')!;
		const text = demoBenchText();
		await bench.upload(db, engineer, found.rail, { fileName: DEMO_BENCH.fileName, text, sizeBytes: Buffer.byteLength(text), metadata: DEMO_BENCH.metadata });
	}
	await db.insert(seedMark).values({ name: mark, appliedAt: new Date() });
	console.log(`[seed] bench file ${DEMO_BENCH.fileName} attached to ${DEMO_BENCH.rail} (${DEMO_BENCH.path})`);
}

/** The demo's seeded times moved onto past working days (./demo-history.ts), once: its own mark. */
async function demoHistory() {
	const mark = 'demo-history-v1';
	const [done] = await db.select().from(seedMark).where(eq(seedMark.name, mark)).limit(1);
	if (done) return;
	const [workspace] = await db.select().from(organization).where(eq(organization.slug, WORKSPACE.slug)).limit(1);
	if (!workspace) return;
	const moved = await spreadDemoHistory(pool, workspace.id);
	await db.insert(seedMark).values({ name: mark, appliedAt: new Date() });
	console.log(`[seed] demo history spread over past working days (${moved} times)`);
}

/** The scale workspace repeats the demo rails with each one's latest design as its base. */
async function scale() {
	const people = await demoPeople();
	const who = (role: string) => people.get(role)!;
	const bases = [...gateway, ...sensorNode].map((s) => ({ rail: s.rail, design: s.revisions[s.revisions.length - 1].design }));
	await seedScale(db, { owner: who('owner'), engineer: who('engineer'), reviewer: who('reviewer'), viewer: who('viewer') }, bases);
}

try {
	await main();
	await demoBench();
	await demoHistory();
	if (process.argv.includes('--scale')) await scale();
} catch (error) {
	console.error('[seed] failed:', error);
	process.exitCode = 1;
} finally {
	await pool.end();
}
