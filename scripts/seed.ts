// Demo seed: an invented company (Kestrel Fieldworks, industrial sensor gateways) with one
// workspace, a demo user per role, two boards, six rails of both topologies, loops in every
// review status (one review pending) and two templates. Runs once per database (seed_mark
// row 'demo-v1'); every step also finds before it creates, so a half-finished run can resume.
// Run: npx tsx scripts/seed.ts   (npm start runs it; DB_* settings as in scripts/env.sh)
// With --scale it also makes the "Scale test" workspace (200 rails × 20 revisions, ./seed-scale.ts).

import { DEMO_PASSWORD, DEMO_USERS } from './demo-users';

import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { createAuth } from '../src/lib/server/auth-core';
import { db, pool } from '../src/lib/server/db';
import { member, organization, rail as railTable, seedMark, template, user } from '../src/lib/server/db/schema';
import * as loops from '../src/lib/server/services/loops';
import * as projects from '../src/lib/server/services/projects';
import * as rails from '../src/lib/server/services/rails';
import * as templates from '../src/lib/server/services/templates';
import * as workspaces from '../src/lib/server/services/workspaces';
import type { RailInput } from '../src/lib/schemas/workspace';
import type { LoopStatus } from '../src/lib/server/db/schema';
import { seedScale } from './seed-scale';

const MARK = 'demo-v1';
const WORKSPACE = { name: 'Kestrel Fieldworks', slug: 'kestrel-fieldworks' };

type Design = Record<string, unknown>;

/** A design document (contract v1) whose network the engine places by the K-factor method. */
function design(p: {
	topology: 'buck' | 'boost';
	vin: number;
	vout: number;
	iout: number;
	fsw: number;
	l: number;
	dcr: number;
	capacitors: { c: number; esr: number; count: number }[];
	vref: number;
	kind: 'type2' | 'type3';
	crossoverHz: number;
	phaseMarginDeg: number;
	vramp?: number;
	feedForward?: boolean;
}): Design {
	return {
		schemaVersion: 1,
		plant: {
			topology: p.topology,
			vin: p.vin,
			vout: p.vout,
			iout: p.iout,
			fsw: p.fsw,
			inductor: { l: p.l, dcr: p.dcr },
			capacitors: p.capacitors.map((c) => ({ ...c, esl: 0 })),
			rdsOn: 0.02
		},
		modulator: { vramp: p.vramp ?? 1, feedForward: p.feedForward ?? false, delay: 0 },
		feedback: { vref: p.vref, r1: 20_000 },
		compensator: {
			kind: p.kind,
			target: { method: 'k-factor', crossoverHz: p.crossoverHz, phaseMarginDeg: p.phaseMarginDeg },
			series: { resistors: 'E96', capacitors: 'E12' }
		}
	};
}

const TOL = { inductorPct: 20, capacitorPct: 20, esrPct: 50, vrefPct: 1 };

interface RailSeed {
	rail: RailInput;
	/** Revisions in order, each with the status it ends in and an optional review note. */
	revisions: { design: Design; message: string; status: LoopStatus; note?: string }[];
}

const gateway: RailSeed[] = [
	{
		rail: { name: '5V0_MAIN', topology: 'buck', vout: 5, vinNom: 24, vinMin: 18, vinMax: 32, ioutNom: 2.5, ioutMin: 0.25, ioutMax: 3.5, fsw: 400e3, tolerances: TOL, marginTargets: null, notes: 'From the 24 V field bus; feeds 3V3_IO and 1V0_CORE.' },
		revisions: [
			{
				design: design({ topology: 'buck', vin: 24, vout: 5, iout: 2.5, fsw: 400e3, l: 15e-6, dcr: 0.025, capacitors: [{ c: 47e-6, esr: 0.004, count: 2 }], vref: 0.8, kind: 'type3', crossoverHz: 35e3, phaseMarginDeg: 60, vramp: 2, feedForward: true }),
				message: 'Type III with input feed-forward, fc 35 kHz',
				status: 'approved',
				note: 'Margins hold across 18–32 V; approved for the EVT build.'
			}
		]
	},
	{
		rail: { name: '3V3_IO', topology: 'buck', vout: 3.3, vinNom: 5, vinMin: 4.75, vinMax: 5.25, ioutNom: 1.2, ioutMin: 0.1, ioutMax: 2, fsw: 1e6, tolerances: TOL, marginTargets: null, notes: null },
		revisions: [
			{
				design: design({ topology: 'buck', vin: 5, vout: 3.3, iout: 1.2, fsw: 1e6, l: 2.2e-6, dcr: 0.02, capacitors: [{ c: 22e-6, esr: 0.003, count: 2 }], vref: 0.6, kind: 'type3', crossoverHz: 80e3, phaseMarginDeg: 55 }),
				message: 'First cut, fc 80 kHz',
				status: 'approved'
			},
			{
				design: design({ topology: 'buck', vin: 5, vout: 3.3, iout: 1.2, fsw: 1e6, l: 2.2e-6, dcr: 0.02, capacitors: [{ c: 22e-6, esr: 0.003, count: 3 }], vref: 0.6, kind: 'type3', crossoverHz: 90e3, phaseMarginDeg: 55 }),
				message: 'Third output capacitor for the radio burst load; fc 90 kHz',
				status: 'draft'
			}
		]
	},
	{
		rail: {
			name: '1V0_CORE',
			topology: 'buck',
			vout: 1.0,
			vinNom: 5,
			vinMin: 4.75,
			vinMax: 5.25,
			ioutNom: 4,
			ioutMin: 0.5,
			ioutMax: 6,
			fsw: 800e3,
			tolerances: { inductorPct: 20, capacitorPct: 30, esrPct: 50, vrefPct: 0.5 },
			// The SoC's load steps need a fast loop; the team accepts a little less phase here.
			marginTargets: { phaseMarginDeg: 50, gainMarginDb: 8, maxCrossoverFraction: 0.1 },
			notes: 'SoC core; polymer bulk capacitor beside the ceramics.'
		},
		revisions: [
			{
				design: design({ topology: 'buck', vin: 5, vout: 1.0, iout: 4, fsw: 800e3, l: 0.68e-6, dcr: 0.004, capacitors: [{ c: 100e-6, esr: 0.002, count: 3 }, { c: 330e-6, esr: 0.012, count: 1 }], vref: 0.6, kind: 'type3', crossoverHz: 60e3, phaseMarginDeg: 60 }),
				message: 'Type III, fc 60 kHz, ceramics plus one polymer',
				status: 'in-review'
			}
		]
	}
];

const sensorNode: RailSeed[] = [
	{
		rail: { name: '5V0_SENSOR', topology: 'boost', vout: 5, vinNom: 3.7, vinMin: 3.0, vinMax: 4.2, ioutNom: 0.3, ioutMin: 0.03, ioutMax: 0.45, fsw: 1e6, tolerances: TOL, marginTargets: null, notes: 'Li-ion cell to the sensor front end.' },
		revisions: [
			{
				design: design({ topology: 'boost', vin: 3.7, vout: 5, iout: 0.3, fsw: 1e6, l: 2.2e-6, dcr: 0.03, capacitors: [{ c: 22e-6, esr: 0.004, count: 2 }], vref: 0.8, kind: 'type3', crossoverHz: 35e3, phaseMarginDeg: 55 }),
				message: 'Type III well below the RHP zero',
				status: 'draft'
			}
		]
	},
	{
		rail: { name: '12V0_BIAS', topology: 'boost', vout: 12, vinNom: 3.7, vinMin: 3.0, vinMax: 4.2, ioutNom: 0.1, ioutMin: 0.02, ioutMax: 0.15, fsw: 600e3, tolerances: TOL, marginTargets: null, notes: 'Bias for the photodiode amplifier.' },
		revisions: [
			{
				design: design({ topology: 'boost', vin: 3.7, vout: 12, iout: 0.1, fsw: 600e3, l: 22e-6, dcr: 0.12, capacitors: [{ c: 10e-6, esr: 0.005, count: 2 }], vref: 1.0, kind: 'type2', crossoverHz: 6e3, phaseMarginDeg: 55 }),
				message: 'Type II, fc 6 kHz',
				status: 'changes-requested',
				note: 'A Type II cannot add enough phase near the double pole: PM is a few degrees. Try a Type III.'
			},
			{
				design: design({ topology: 'boost', vin: 3.7, vout: 12, iout: 0.1, fsw: 600e3, l: 22e-6, dcr: 0.12, capacitors: [{ c: 10e-6, esr: 0.005, count: 2 }], vref: 1.0, kind: 'type3', crossoverHz: 15e3, phaseMarginDeg: 55 }),
				message: 'Type III as asked in review, fc 15 kHz',
				status: 'draft'
			}
		]
	},
	{
		rail: { name: '1V8_MCU', topology: 'buck', vout: 1.8, vinNom: 3.7, vinMin: 3.0, vinMax: 4.2, ioutNom: 0.2, ioutMin: 0.01, ioutMax: 0.35, fsw: 2e6, tolerances: TOL, marginTargets: null, notes: null },
		revisions: [
			{
				design: design({ topology: 'buck', vin: 3.7, vout: 1.8, iout: 0.2, fsw: 2e6, l: 1e-6, dcr: 0.05, capacitors: [{ c: 22e-6, esr: 0.003, count: 1 }], vref: 0.6, kind: 'type3', crossoverHz: 100e3, phaseMarginDeg: 55 }),
				message: 'Type III, fc 100 kHz',
				status: 'approved'
			}
		]
	}
];

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

/** The scale workspace repeats the demo rails with each one's latest design as its base. */
async function scale() {
	const people = await demoPeople();
	const who = (role: string) => people.get(role)!;
	const bases = [...gateway, ...sensorNode].map((s) => ({ rail: s.rail, design: s.revisions[s.revisions.length - 1].design }));
	await seedScale(db, { owner: who('owner'), engineer: who('engineer'), reviewer: who('reviewer'), viewer: who('viewer') }, bases);
}

try {
	await main();
	if (process.argv.includes('--scale')) await scale();
} catch (error) {
	console.error('[seed] failed:', error);
	process.exitCode = 1;
} finally {
	await pool.end();
}
