// Sign-off, templates, bench data and exports through the API against MariaDB: review requests
// with their e-mails (captured by the fake SMTP server), the author-may-not-decide rule, the
// decision e-mail, the lock on an approved revision, pinned comments, the report, every export
// (the netlist run in ngspice when it is on PATH), design import, templates scaled to another
// plant, and bench uploads with line/column errors and the model overlay.
import './support/env';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyzeDesignDetailed, frequencyResponse } from '../../src/lib/engine';
import { parseBenchFile } from '../../src/lib/bench';
import { servedApp } from './support/app';
import { buckDesign } from './support/designs';
import { buildTeam, railBody, testDb, type Team } from './support/fixtures';
import { waitForMail } from './support/mail';

const app = servedApp();
const { db, pool } = testDb();
let team: Team;
let projectId: string;
const work = mkdtempSync(path.join(tmpdir(), 'loopwright-signoff-'));

beforeAll(async () => {
	team = await buildTeam(app.origin, db);
	projectId = (await team.as.owner.post(`/api/v1/projects?workspace=${team.workspaceId}`, { name: 'Sign-off board' })).body.id;
});
afterAll(async () => {
	await pool.end();
	rmSync(work, { recursive: true, force: true });
});

let railCount = 0;
async function newRail(overrides: Record<string, unknown> = {}) {
	const name = `SO_${++railCount}_${Math.random().toString(36).slice(2, 6).toUpperCase()}`;
	const reply = await team.as.owner.post(`/api/v1/projects/${projectId}/rails`, { ...railBody(name), ...overrides });
	expect(reply.status, JSON.stringify(reply.body)).toBe(201);
	return reply.body as { id: string; name: string };
}
async function saveLoop(who: keyof Team['as'], railId: string, base: number | null, design: unknown = buckDesign(), message = 'cut') {
	const reply = await team.as[who].post(`/api/v1/rails/${railId}/loops`, { baseRevision: base, design, message });
	expect(reply.status, JSON.stringify(reply.body)).toBe(201);
	return reply.body as { id: string; revision: number; status: string };
}

describe('review requests and sign-off', () => {
	it('mails each named reviewer, queues the loop, refuses the author, mails the decision and locks the revision', async () => {
		const { engineer, reviewer, owner, viewer } = team.as;
		const rail = await newRail();
		const r1 = await saveLoop('engineer', rail.id, null);

		// Only owners and reviewers can be asked, never the author.
		const wrong = await engineer.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-review', reviewerIds: [viewer.userId, engineer.userId] });
		expect(wrong.status).toBe(400);
		expect(wrong.body.error.fields).toMatchObject({ 'reviewerIds.0': expect.stringContaining('not an owner or reviewer'), 'reviewerIds.1': expect.any(String) });

		const asked = await engineer.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-review', reviewerIds: [reviewer.userId, owner.userId], comment: 'check Vin max' });
		expect(asked.status, JSON.stringify(asked.body)).toBe(200);
		expect(asked.body.status).toBe('in-review');
		expect(asked.body.requests.map((r: { status: string }) => r.status)).toEqual(['pending', 'pending']);
		expect(asked.body.mail.sent.sort()).toEqual([reviewer.email, owner.email].sort());
		const mail = await waitForMail(reviewer.email, /^Sign-off requested/);
		expect(mail.subject).toBe(`Sign-off requested: ${rail.name} r1`);
		expect(mail.text).toContain(`/w/${team.workspaceId}/reviews/${r1.id}`);
		expect(mail.text).toContain('check Vin max');

		const queue = await reviewer.get(`/api/v1/reviews?workspace=${team.workspaceId}`);
		expect(queue.body.assigned.find((a: { loopId: string }) => a.loopId === r1.id)).toMatchObject({ requestStatus: 'pending', railName: rail.name, revision: 1 });
		// The engineer was not asked, but sees it among the loops waiting in review.
		expect((await engineer.get(`/api/v1/reviews?workspace=${team.workspaceId}`)).body.waiting.some((w: { loopId: string }) => w.loopId === r1.id)).toBe(true);

		const noNote = await reviewer.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-changes' });
		expect(noNote.status).toBe(400);
		expect(noNote.body.error.fields.comment).toBe('say what must change');

		const approved = await reviewer.post(`/api/v1/loops/${r1.id}/review`, { action: 'approve', comment: 'margins fine' });
		expect(approved.status, JSON.stringify(approved.body)).toBe(200);
		expect(approved.body.status).toBe('approved');
		const answers = Object.fromEntries(approved.body.requests.map((r: { reviewerId: string; status: string }) => [r.reviewerId, r.status]));
		expect(answers).toEqual({ [reviewer.userId]: 'approved', [owner.userId]: 'superseded' });
		const decision = await waitForMail(engineer.email, /^Approved/);
		expect(decision.subject).toBe(`Approved: ${rail.name} r1`);
		expect(decision.text).toContain('margins fine');

		// Locked: no further move on r1; an edit is a new draft revision needing its own review.
		expect((await owner.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-changes', comment: 'late' })).status).toBe(422);
		const r2 = await saveLoop('engineer', rail.id, 1, buckDesign({ crossoverHz: 30_000 }), 'lower fc');
		expect(r2.status).toBe('draft');
		expect((await viewer.get(`/api/v1/loops/${r1.id}`)).body.status).toBe('approved');
		// The rail's latest revision (what board health shows) is the new draft.
		expect((await viewer.get(`/api/v1/rails/${rail.id}`)).body.latestRevision).toBe(2);

		const trail = await viewer.get(`/api/v1/audit?workspace=${team.workspaceId}&entityId=${r1.id}`);
		const actions = trail.body.items.map((a: { action: string }) => a.action);
		expect(actions.filter((a: string) => a === 'review.request')).toHaveLength(2);
		expect(actions).toEqual(expect.arrayContaining(['loop.save', 'loop.request-review', 'loop.approve']));

		// r2's report diffs against the approved r1.
		const report = await reviewer.get(`/api/v1/loops/${r2.id}/report`);
		expect(report.body.diffs.approved).toMatchObject({ baseRevision: 1 });
		expect(report.body.diffs.approved.changes).toEqual([{ path: 'compensator.target.crossoverHz', before: 40_000, after: 30_000 }]);
	});

	it('refuses an owner approving their own revision (403 own-revision), and lets a reviewer send it back with a note', async () => {
		const { owner, reviewer } = team.as;
		const rail = await newRail();
		const r1 = await saveLoop('owner', rail.id, null);
		await owner.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-review', reviewerIds: [reviewer.userId] });
		const self = await owner.post(`/api/v1/loops/${r1.id}/review`, { action: 'approve' });
		expect(self.status).toBe(403);
		expect(self.body.error.code).toBe('own-revision');
		const back = await reviewer.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-changes', comment: 'PM at Vin max is thin' });
		expect(back.body.status).toBe('changes-requested');
		const mail = await waitForMail(owner.email, /^Changes requested/);
		expect(mail.subject).toBe(`Changes requested: ${rail.name} r1`);
		expect(mail.text).toContain('PM at Vin max is thin');
	});

	it('keeps comments pinned to a frequency and rejects a bad one', async () => {
		const rail = await newRail();
		const r1 = await saveLoop('engineer', rail.id, null);
		const pinned = await team.as.reviewer.post(`/api/v1/loops/${r1.id}/comments`, { body: 'phase dip here', freqHz: 45_000 });
		expect(pinned.status).toBe(201);
		expect((await team.as.viewer.get(`/api/v1/loops/${r1.id}/comments`)).body.items[0]).toMatchObject({ body: 'phase dip here', freqHz: 45_000 });
		const bad = await team.as.reviewer.post(`/api/v1/loops/${r1.id}/comments`, { body: 'x', freqHz: -5 });
		expect(bad.status).toBe(400);
		expect(bad.body.error.fields.freqHz).toBe('must be > 0 Hz');
	});

	it('reports the verdict stored at save (never recomputed), a step response, and both diffs', async () => {
		const rail = await newRail();
		const r1 = await saveLoop('engineer', rail.id, null);
		const stored = (await team.as.viewer.get(`/api/v1/loops/${r1.id}`)).body.verification;
		const report = (await team.as.viewer.get(`/api/v1/loops/${r1.id}/report`)).body;
		const { list: _list, ...counts } = stored.corners;
		expect(report.verification).toEqual({ ...stored, corners: counts });
		expect(report.figures.status).toBe(stored.status);
		// The corner table leads with the corners that set a worst value.
		expect(report.corners[0].setsWorst).toBe(true);
		expect(report.corners.map((c: { label: string }) => c.label)).toContain(stored.worst.phaseMarginDeg.corner);
		expect(report.steps.stable).toBe(true);
		expect(report.steps.loadStep.figures.peakDeviation).toBeLessThan(0); // more load pulls the output down [fact of the trade]
		expect(report.spec.corners).toEqual({ vin: { min: 9, max: 16 }, iout: { min: 0.2, max: 3 } });
		expect(report.plot.freqHz.length).toBe(400);
		expect(report.plot.corners.length).toBeGreaterThan(0);
		expect(report.diffs).toEqual({ previous: null, approved: null });
	});

	it('answers the review page its two halves apart: the database record with the caller role, and the drawing', async () => {
		const rail = await newRail();
		const r1 = await saveLoop('engineer', rail.id, null);
		const whole = (await team.as.viewer.get(`/api/v1/loops/${r1.id}/report`)).body;
		const record = await team.as.viewer.get(`/api/v1/loops/${r1.id}/report?part=record`);
		expect(record.status).toBe(200);
		expect(record.body.role).toBe('viewer');
		expect(record.body.loop).toMatchObject({ id: r1.id, workspaceId: team.workspaceId, revision: 1 });
		expect(record.body.verification).toEqual(whole.verification);
		expect(record.body.corners).toEqual(whole.corners);
		// The record never carries the analysis pool's part.
		expect(record.body).not.toHaveProperty('plot');
		expect(record.body).not.toHaveProperty('steps');
		const drawing = await team.as.viewer.get(`/api/v1/loops/${r1.id}/report?part=drawing`);
		expect(drawing.status).toBe(200);
		expect(drawing.body.analysisError).toBeNull();
		expect(drawing.body.plot.freqHz).toEqual(whole.plot.freqHz);
		expect(drawing.body.steps.loadStep.figures).toEqual(whole.steps.loadStep.figures);
		expect(drawing.body).not.toHaveProperty('trail');
		const bad = await team.as.viewer.get(`/api/v1/loops/${r1.id}/report?part=everything`);
		expect(bad.status).toBe(400);
		expect(bad.body.error.fields.part).toBe('part is record or drawing');
		// Another workspace's caller learns nothing, whatever the part.
		expect((await team.outsider.get(`/api/v1/loops/${r1.id}/report?part=record`)).status).toBe(404);
	});

	it('r2 after r1 was sent back is compared with r1 (parameters and verdict), and with the last approved revision once there is one', async () => {
		const { engineer, reviewer } = team.as;
		const rail = await newRail();
		const r1 = await saveLoop('engineer', rail.id, null);
		await engineer.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-review' });
		await reviewer.post(`/api/v1/loops/${r1.id}/review`, { action: 'request-changes', comment: 'lower the crossover' });
		const r2 = await saveLoop('engineer', rail.id, 1, buckDesign({ crossoverHz: 25_000 }), 'fc 25 kHz');
		const view = (await team.as.viewer.get(`/api/v1/loops/${r2.id}/report`)).body;
		expect(view.diffs.previous).toMatchObject({ baseRevision: 1, baseStatus: 'changes-requested' });
		expect(view.diffs.previous.changes).toEqual([{ path: 'compensator.target.crossoverHz', before: 40_000, after: 25_000 }]);
		// A crossover 40 → 25 kHz moves the verdict's worst crossover.
		expect(view.diffs.previous.verdict.map((v: { metric: string }) => v.metric)).toContain('fc');
		expect(view.diffs.approved).toBeNull();
		await engineer.post(`/api/v1/loops/${r2.id}/review`, { action: 'request-review' });
		await reviewer.post(`/api/v1/loops/${r2.id}/review`, { action: 'approve' });
		const r3 = await saveLoop('engineer', rail.id, 2, buckDesign({ crossoverHz: 25_000, feedForward: true }), 'feed-forward');
		const v3 = (await team.as.viewer.get(`/api/v1/loops/${r3.id}/report`)).body;
		expect(v3.diffs.previous.baseRevision).toBe(2);
		expect(v3.diffs.approved).toMatchObject({ baseRevision: 2, baseStatus: 'approved', changes: [{ path: 'modulator.feedForward', before: false, after: true }] });
	});
});

async function download(path: string) {
	const res = await fetch(app.origin + path, { headers: { cookie: team.as.viewer.cookie } });
	return { status: res.status, type: res.headers.get('content-type') ?? '', disposition: res.headers.get('content-disposition') ?? '', bytes: Buffer.from(await res.arrayBuffer()) };
}

describe('exports of a revision', () => {
	let loopId: string;
	let railName: string;
	beforeAll(async () => {
		const rail = await newRail();
		railName = rail.name;
		loopId = (await saveLoop('engineer', rail.id, null)).id;
	});

	it('serves the sweep as CSV that reads back through the bench parser with the same crossover', async () => {
		const csv = await download(`/api/v1/loops/${loopId}/exports/csv`);
		expect(csv.status).toBe(200);
		expect(csv.type).toMatch(/^text\/csv/);
		expect(csv.disposition).toBe(`attachment; filename="${railName}-r1.csv"`);
		const parsed = parseBenchFile(csv.bytes.toString('utf8'));
		if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
		const engine = analyzeDesignDetailed(buckDesign(), { includeResponse: false });
		if ('error' in engine) throw new Error(engine.error.message);
		expect(parsed.data.freqHz.length).toBe(400);
		// Round trip: a crossing read from the exported samples lands on the engine's (within the 400-point grid).
		const i = parsed.data.magDb.findIndex((m) => m < 0);
		expect(parsed.data.freqHz[i - 1]).toBeLessThan(engine.metrics.crossoverHz!);
		expect(parsed.data.freqHz[i]).toBeGreaterThan(engine.metrics.crossoverHz!);
	});

	it('serves the plot as SVG and PNG, with corners or one corner', async () => {
		const svg = await download(`/api/v1/loops/${loopId}/exports/svg?corners=1`);
		expect(svg.type).toMatch(/^image\/svg\+xml/);
		const text = svg.bytes.toString('utf8');
		expect(text.startsWith('<svg')).toBe(true);
		expect(text).not.toMatch(/NaN|Infinity/);
		// corner=N: the N-th corner that sets a worst value of the stored verdict, named in the title.
		const stored = (await team.as.viewer.get(`/api/v1/loops/${loopId}`)).body.verification;
		const one = await download(`/api/v1/loops/${loopId}/exports/svg?corner=0`);
		expect(one.status).toBe(200);
		expect(one.bytes.toString('utf8')).toContain(stored.worst.phaseMarginDeg.corner);
		expect((await download(`/api/v1/loops/${loopId}/exports/svg?corner=9`)).status).toBe(400);
		const png = await download(`/api/v1/loops/${loopId}/exports/png?width=400`);
		expect(png.type).toBe('image/png');
		// PNG signature and IHDR width [published: PNG specification, ISO/IEC 15948 §5.2, §11.2.2].
		expect(png.bytes.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
		expect(png.bytes.readUInt32BE(16)).toBe(800);
	});

	it('serves the signed-off design JSON (built parts and the stored verdict), which imports back as the same network; a broken file gets field errors', async () => {
		const json = await download(`/api/v1/loops/${loopId}/exports/json`);
		expect(json.type).toMatch(/^application\/json/);
		const doc = JSON.parse(json.bytes.toString('utf8'));
		expect(doc.plant.inductor.l).toBe(10e-6);
		const stored = (await team.as.viewer.get(`/api/v1/loops/${loopId}`)).body.verification;
		expect(doc.signoff.verification).toEqual(stored);
		expect(doc.signoff.placement.target).toMatchObject({ method: 'k-factor', crossoverHz: 40_000 });
		const built = stored.parts.rounded ?? stored.parts.ideal;
		for (const k of ['r2', 'r3', 'c1', 'c2', 'c3']) expect(doc.compensator.parts[k]).toBe(built[k]);
		const rail = await newRail();
		const ok = await team.as.engineer.post(`/api/v1/rails/${rail.id}/import`, { text: json.bytes.toString('utf8'), baseRevision: null });
		expect(ok.status, JSON.stringify(ok.body)).toBe(201);
		expect(ok.body.revision).toBe(1);
		// The imported file builds the same network on the same plant: the same nominal margins (to 1e-9).
		expect(ok.body.verification.nominal.phaseMarginDeg - stored.nominal.phaseMarginDeg).toBeCloseTo(0, 9);
		expect(ok.body.verification.nominal.crossoverHz / stored.nominal.crossoverHz - 1).toBeCloseTo(0, 9);
		doc.plant.inductor.l = -1;
		const bad = await team.as.engineer.post(`/api/v1/rails/${rail.id}/import`, { document: doc, baseRevision: 1 });
		expect(bad.status).toBe(400);
		expect(bad.body.error.fields['document.plant.inductor.l']).toBe('must be > 0');
		const garbage = await team.as.engineer.post(`/api/v1/rails/${rail.id}/import`, { text: '{ not json', baseRevision: 1 });
		expect(garbage.body.error.fields['document']).toMatch(/is not valid JSON/);
		expect((await team.as.engineer.post(`/api/v1/rails/${rail.id}/import`, { document: buckDesign(), baseRevision: 0 })).status).toBe(409);
	});

	it('serves the sign-off report as a PDF', async () => {
		const pdf = await download(`/api/v1/loops/${loopId}/exports/pdf`);
		expect(pdf.status).toBe(200);
		expect(pdf.type).toBe('application/pdf');
		// A PDF file starts with the %PDF- header and ends with %%EOF [published: ISO 32000-1 §7.5.2, §7.5.5].
		expect(pdf.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
		expect(pdf.bytes.subarray(-8).toString('latin1')).toContain('%%EOF');
		expect((await download(`/api/v1/loops/${loopId}/exports/docx`)).status).toBe(404);
	});

	const hasNgspice = spawnSync('ngspice', ['-v'], { stdio: 'ignore' }).status === 0;
	it.runIf(hasNgspice)('serves a netlist that ngspice runs and that reproduces the loop gain within 0.05 dB and 0.5°', async () => {
		const spice = await download(`/api/v1/loops/${loopId}/exports/spice?batch=1`);
		expect(spice.disposition).toContain('.cir"');
		const file = path.join(work, 'api.cir');
		writeFileSync(file, spice.bytes);
		const run = spawnSync('ngspice', ['-b', file], { encoding: 'utf8', timeout: 30_000 });
		expect(run.status, run.stderr).toBe(0);
		const rows = run.stdout
			.split('\n')
			.map((l) => l.trim().split(/\s+/))
			.filter((c) => c.length === 4 && /^\d+$/.test(c[0]))
			.map((c) => c.slice(1).map(Number));
		expect(rows.length).toBeGreaterThan(100);
		const engine = analyzeDesignDetailed(buckDesign(), { includeResponse: false });
		if ('error' in engine) throw new Error(engine.error.message);
		const inBand = rows.filter(([f]) => f <= 250_000);
		const model = frequencyResponse(engine.loop, Float64Array.from(inBand.map(([f]) => f)));
		inBand.forEach(([f, db, deg], k) => {
			expect(Math.abs(db - model.magDb[k]), `|T| at ${f} Hz`).toBeLessThan(0.05);
			const d = deg - model.phaseDeg[k];
			expect(Math.abs(d - 360 * Math.round(d / 360)), `phase at ${f} Hz`).toBeLessThan(0.5);
		});
	});
});

describe('templates', () => {
	it('saves a strategy relative to the plant, applies it to a different rail and shows who uses it', async () => {
		const { engineer, viewer } = team.as;
		const source = await newRail();
		const loop = await saveLoop('engineer', source.id, null);
		const tpl = await engineer.post(`/api/v1/loops/${loop.id}/template`, { name: `K-factor fsw/12.5 ${source.name}`, description: 'ceramic buck' });
		expect(tpl.status, JSON.stringify(tpl.body)).toBe(201);
		// 40 kHz crossover on a 500 kHz rail (the fixture's target) is fsw × 0.08.
		expect(tpl.body.compensator).toMatchObject({ kind: 'type3', target: { method: 'k-factor', crossoverFraction: 0.08, phaseMarginDeg: 60 }, series: { resistors: 'E96', capacitors: 'E12' } });

		// Another plant: 400 kHz, 2.5 A. Its own saved loop supplies the power stage.
		const other = await newRail({ fsw: 400_000 });
		const design = buckDesign();
		design.plant.fsw = 400_000;
		await saveLoop('engineer', other.id, null, design, 'stage');
		const preview = await viewer.post(`/api/v1/templates/${tpl.body.id}/apply`, { railId: other.id });
		expect(preview.status, JSON.stringify(preview.body)).toBe(200);
		// K-factor places fc and PM exactly with ideal parts [published: Venable 1983]; E96/E12 rounding moves them a little.
		expect(preview.body.metrics.crossoverHz / 32_000).toBeGreaterThan(0.9);
		expect(preview.body.metrics.crossoverHz / 32_000).toBeLessThan(1.1);
		expect(Math.abs(preview.body.metrics.phaseMarginDeg - 60)).toBeLessThan(5);
		// The preview carries the verdict a save would store, against the other rail's spec.
		expect(['pass', 'caution', 'fail']).toContain(preview.body.verification.status);
		expect(preview.body.verification.corners.count).toBeGreaterThanOrEqual(9);
		expect(preview.body.saved).toBeNull();

		const saved = await engineer.post(`/api/v1/templates/${tpl.body.id}/apply`, { railId: other.id, save: true });
		expect(saved.status).toBe(201);
		expect(saved.body.saved.revision).toBe(2);
		expect((await viewer.get(`/api/v1/templates/${tpl.body.id}/rails`)).body.items).toEqual([expect.objectContaining({ railId: other.id, revision: 2 })]);

		const boost = await newRail({ topology: 'boost', vout: 24, vinNom: 12, vinMin: 9, vinMax: 16 });
		const mismatch = await viewer.post(`/api/v1/templates/${tpl.body.id}/apply`, { railId: boost.id });
		expect(mismatch.status).toBe(422);
		expect(mismatch.body.error.code).toBe('topology-mismatch');
	});
});

describe('bench data', () => {
	let railId: string;
	let loopId: string;
	let csv: string;
	beforeAll(async () => {
		railId = (await newRail()).id;
		loopId = (await saveLoop('engineer', railId, null)).id;
		csv = (await download(`/api/v1/loops/${loopId}/exports/csv`)).bytes.toString('utf8');
	});

	it('stores a JSON upload and overlays it: the exported sweep read back deviates by nothing from its own model', async () => {
		const up = await team.as.engineer.post(`/api/v1/rails/${railId}/bench`, { fileName: 'sweep.csv', text: csv, metadata: { vin: 12, iout: 2, instrument: 'FRA', injectionPoint: '10 Ω in the feedback', measuredAt: '2026-11-30' } });
		expect(up.status, JSON.stringify(up.body)).toBe(201);
		expect(up.body).toMatchObject({ points: 400, kind: 'loop', metadata: { vin: 12, injectionPoint: '10 Ω in the feedback' } });
		const got = await team.as.viewer.get(`/api/v1/bench/${up.body.id}?loop=${loopId}`);
		expect(got.body.series.freqHz).toHaveLength(400);
		const o = got.body.overlay;
		expect(o.deviation.magDb.maxAbs).toBeLessThan(1e-6);
		expect(o.deviation.phaseDeg.maxAbs).toBeLessThan(1e-6);
		expect(o.deviation.stopHz).toBeLessThanOrEqual(250_000);
		expect(o.metrics.crossoverHz / o.model.crossoverHz).toBeCloseTo(1, 2);
		expect(o.metrics.phaseMarginDeg - o.model.phaseMarginDeg).toBeCloseTo(0, 0);
		expect((await team.as.viewer.get(`/api/v1/rails/${railId}/bench`)).body.items.map((b: { id: string }) => b.id)).toContain(up.body.id);
	});

	it('takes multipart uploads with metadata fields, and names the line and column of a bad cell', async () => {
		const form = new FormData();
		form.append('file', new Blob([csv], { type: 'text/csv' }), 'bench.csv');
		form.append('vin', '12');
		form.append('instrument', 'FRA');
		const res = await fetch(`${app.origin}/api/v1/rails/${railId}/bench`, { method: 'POST', body: form, headers: { cookie: team.as.engineer.cookie, origin: app.origin } });
		expect(res.status).toBe(201);
		expect((await res.json()).metadata).toMatchObject({ vin: 12, instrument: 'FRA' });

		const broken = 'Frequency (Hz),Gain (dB),Phase (deg)\n100,40,-90\n1000,20,-100\n10000,abc,-120\n';
		const bad = await team.as.engineer.post(`/api/v1/rails/${railId}/bench`, { fileName: 'bad.csv', text: broken });
		expect(bad.status).toBe(400);
		expect(bad.body.error.code).toBe('invalid-bench-file');
		expect(bad.body.error.fields.file).toMatch(/^line 4, column 2/);
		expect(bad.body.error.issues[0]).toMatchObject({ line: 4, column: 2 });

		const meta = await team.as.engineer.post(`/api/v1/rails/${railId}/bench`, { fileName: 'm.csv', text: csv, metadata: { vin: -3, measuredAt: 'yesterday' } });
		expect(meta.status).toBe(400);
		expect(meta.body.error.fields).toMatchObject({ 'metadata.vin': 'must be > 0', 'metadata.measuredAt': 'must be an ISO date (YYYY-MM-DD)' });
	});

	it('refuses a file over 5 MB with 413', async () => {
		const big = 'Frequency (Hz),Gain (dB),Phase (deg)\n' + '1000,20,-100\n'.repeat(420_000);
		const reply = await team.as.engineer.post(`/api/v1/rails/${railId}/bench`, { fileName: 'big.csv', text: big });
		expect(reply.status).toBe(413);
	});
});
