/**
 * Exports of a loop revision: CSV sweep, SVG and PNG plot, sign-off PDF, design JSON. Checks against outside facts:
 * the PNG signature and IHDR layout [published: PNG specification, W3C/ISO 15948], the PDF header and trailer
 * [published: ISO 32000-1 §7.5], CSV read back with papaparse and with our bench parser, JSON via the zod contract.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import Papa from 'papaparse';
import { Resvg } from '@resvg/resvg-js';
import { designSensitivity, type SensitivityReport } from '$lib/engine/sensitivity';
import { designDocumentSchema } from '$lib/engine/contract/designSchema';
import { sensitivityCells } from '$lib/verdict/sensitivityText';
import { switchingCheckOfDesign } from '$lib/engine/pipeline/switchingCircuit';
import { switchingFigureRows } from '$lib/verdict/switchingText';
import { describe, expect, it } from 'vitest';
import { parseBenchFile } from '$lib/bench';
import { analyzeDesign, type AnalysisResponse } from '$lib/engine';
import {
	buildSignoffPdf,
	exportDesignJson,
	importDesignJson,
	networkRoots,
	plotFromResponse,
	renderBodePng,
	renderBodeSvg,
	REPORT_CAUTION,
	SWEEP_CSV_COLUMNS,
	sweepCsv
} from '$lib/server/exports';
import { jetBrainsMonoTtf } from '$lib/server/exports/fonts';
import { exportSignedOffJson, verdictCsv } from '$lib/server/exports';
import { verifyDesign } from '$lib/engine/verify/verifyDesign';
import { STATUS_WORDS, VERDICT_LABELS } from '$lib/engine/verify/text';
import type { Verification } from '$lib/engine/verify/types';
import { withRailSpec } from '$lib/spec/railSpec';
import { verdictFigures, verdictLine } from '$lib/verdict/figures';
import { flat, pdfText } from '../../support/pdfText';

const load = (name: string) => JSON.parse(readFileSync(path.resolve('reference/cases', name), 'utf8'));
function analyse(doc: unknown): AnalysisResponse {
	const r = analyzeDesign(doc);
	if ('error' in r) throw new Error(r.error.message);
	return r;
}
const buckDoc = load('buck-ceramic-1v2.json');
const buck = analyse(buckDoc);

describe('sweepCsv', () => {
	it('one row per frequency under a header with units; papaparse reads the numbers back', () => {
		const csv = sweepCsv(buck);
		const parsed = Papa.parse<string[]>(csv.trim(), { header: false });
		expect(parsed.errors).toEqual([]);
		expect(parsed.data[0]).toEqual([...SWEEP_CSV_COLUMNS]);
		expect(parsed.data).toHaveLength(buck.response.freqHz.length + 1);
		const i = 123;
		const row = parsed.data[i + 1].map(Number);
		expect(row[0] / buck.response.freqHz[i]).toBeCloseTo(1, 9);
		expect(row[1]).toBeCloseTo(buck.response.loop.magDb[i], 7);
		expect(row[6]).toBeCloseTo(buck.response.compensator.phaseDeg[i], 7);
	});

	it('reads back through the bench parser as a loop gain with the same crossover', () => {
		const r = parseBenchFile(sweepCsv(buck));
		if (!r.ok) throw new Error(JSON.stringify(r.errors));
		expect(r.data.format.columns.gain.name).toBe('Loop gain (dB)');
		expect(r.data.magDb).toHaveLength(buck.response.freqHz.length);
		r.data.phaseDeg.forEach((p, i) => expect(p).toBeCloseTo(buck.response.loop.phaseDeg[i], 6));
	});
});

describe('renderBodeSvg', () => {
	const plot = plotFromResponse(buck, { fswHz: buckDoc.plant.fsw, title: 'buck-ceramic-1v2' });

	it('draws every trace as a path, in the palette and JetBrains Mono, with the chips, and no NaN', () => {
		const svg = renderBodeSvg(plot, { roots: networkRoots(buck) });
		expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
		expect(svg).not.toMatch(/NaN|Infinity|undefined/);
		const traces = svg.match(/<path d="M[^"]+" fill="none"/g) ?? [];
		expect(traces.length).toBe(6); // loop, plant, network × magnitude, phase
		expect(svg).toContain('font-family="JetBrains Mono, monospace"');
		expect(svg).toContain('#0e6f68'); // magnitude teal [identity sheet]
		expect(svg).toContain('#b4531a'); // phase orange [identity sheet]
		expect(svg).toMatch(/fc [\d.]+ kHz · PM [\d.]+°/);
		expect(svg).toMatch(/GM [\d.]+ dB at/);
		expect(svg).toContain('url(#hatch)'); // the band above fsw/2
	});

	it('the frequency axis names its unit and a bench series is named in the legend (failed before)', () => {
		const bench = { label: 'FRA bench 2', freqHz: [1e3, 1e4], magDb: [30, 10], phaseDeg: [-100, -120] };
		const svg = renderBodeSvg({ ...plot, measured: [bench] });
		expect(svg).toContain('>frequency (Hz)</text>');
		expect(svg).not.toMatch(/>frequency<\/text>/);
		expect(svg).toMatch(/<text[^>]*>FRA bench 2<\/text>/);
	});

	it('non-finite samples become gaps, never NaN coordinates; the dark theme swaps the palette', () => {
		const broken = {
			...plot,
			traces: plot.traces.map((t) => ({ ...t, magDb: Array.from(t.magDb, (v, i) => (i % 7 === 0 ? NaN : i % 11 === 0 ? Infinity : v)) }))
		};
		const svg = renderBodeSvg(broken, { theme: 'dark' });
		expect(svg).not.toMatch(/NaN|Infinity/);
		expect(svg).toContain('#33c2b5');
		expect(svg).not.toContain('#0e6f68');
	});

	it('an empty plot still renders a valid frame', () => {
		const svg = renderBodeSvg({ freqHz: [], traces: [], crossover: null, gainMargin: null, modelLimitHz: null });
		expect(svg).not.toMatch(/NaN|Infinity/);
		expect(() => new Resvg(svg, { font: { loadSystemFonts: false } }).render()).not.toThrow();
	});
});

describe('renderBodePng', () => {
	it('PNG signature, IHDR chunk and the requested width; height keeps the aspect ratio', () => {
		const png = renderBodePng(plotFromResponse(buck, { fswHz: buckDoc.plant.fsw }), { width: 900, pixelWidth: 1200 });
		// [published: PNG spec §5.2 signature 89 50 4E 47 0D 0A 1A 0A; §11.2.2 IHDR first, width then height, big-endian]
		expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
		expect(png.subarray(12, 16).toString('ascii')).toBe('IHDR');
		expect(png.readUInt32BE(16)).toBe(1200);
		const svg = renderBodeSvg(plotFromResponse(buck), { width: 900 });
		const h = Number(/height="(\d+)"/.exec(svg)![1]);
		expect(png.readUInt32BE(20)).toBe(Math.round((h * 1200) / 900));
	});

	it('the npm TTF draws text: a label renders ink pixels with the bundled font and none without fonts', () => {
		const svg = '<svg xmlns="http://www.w3.org/2000/svg" width="120" height="30"><text x="4" y="20" font-family="JetBrains Mono" font-size="16" fill="#000">fc 60k</text></svg>';
		const ink = (fontFiles: string[]) => {
			const px = new Resvg(svg, { font: { loadSystemFonts: false, fontFiles, defaultFontFamily: 'JetBrains Mono' } }).render().pixels;
			let n = 0;
			for (let i = 3; i < px.length; i += 4) if (px[i] > 0) n++;
			return n;
		};
		expect(ink([jetBrainsMonoTtf()])).toBeGreaterThan(50);
		expect(ink([])).toBe(0);
	});
});

// pdfkit splits the PNG's alpha channel in JavaScript: about a second per report on 2 cores.
describe('buildSignoffPdf', { timeout: 60_000 }, () => {
	// The buck with a rail's spec (Vin 10–14 V, load 0.5–6 A), verified by the engine as a save would.
	const spec = { vinMin: buckDoc.plant.vin * 0.9, vinMax: buckDoc.plant.vin * 1.1, ioutMin: buckDoc.plant.iout * 0.25, ioutMax: buckDoc.plant.iout * 1.5, tolerances: { inductorPct: 20, capacitorPct: 20, esrPct: 50 }, targets: { phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 } };
	const specDoc = withRailSpec({ ...buckDoc, spread: { samples: 60, seed: 3 } }, spec);
	const verified = verifyDesign(specDoc);
	if ('error' in verified) throw new Error(verified.error.message);
	const verification: Verification = verified;

	it('a PDF with header and trailer, the plot image, the embedded mono font, the stored verdict and every section in its text', async () => {
		const pdf = await buildSignoffPdf({
			rail: { name: '1V2_CORE', board: 'Demo board' },
			revision: { label: 'r3', author: 'Ada Engineer', createdAt: '2026-11-30T10:00:00Z', status: 'approved' },
			document: specDoc as never,
			response: buck,
			verification,
			review: [
				{ at: '2026-11-30T11:00:00Z', who: 'Ada Engineer', action: 'requested review' },
				{ at: '2026-11-30T12:00:00Z', who: 'Bo Reviewer', action: 'approved', note: 'Margins fine at both corners', freqHz: 58000 }
			],
			generatedAt: new Date('2026-12-01T09:00:00Z')
		});
		// [published: ISO 32000-1 §7.5.2 header "%PDF-1.n", §7.5.5 file ends with %%EOF]
		expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
		expect(pdf.subarray(-6).toString('latin1')).toMatch(/%%EOF\s*$/);
		const raw = pdf.toString('latin1');
		expect(raw).toMatch(/\/Subtype \/Image/);
		expect(raw).toMatch(/\/FontFile2/);
		const t = await pdfText(pdf);
		const text = flat(t.text);
		for (const s of ['Loop sign-off report', 'Rail 1V2_CORE on board Demo board', 'Verdict', 'Verification spec', 'Design', 'Parts list', 'Engine warnings', 'Review trail', 'Cautions']) {
			expect(text).toContain(s);
		}
		// The verdict's figures, set in the embedded mono font, read back exactly as every screen prints them.
		expect(text).toContain(verdictLine(verdictFigures(verification)));
		expect(text).toContain(`${verification.status.toUpperCase()}: ${flat(verification.summary)}`);
		expect(text).toContain('Small-signal estimate; confirm margins and transients on hardware');
		expect(text).toContain('above 60 V DC or at mains follow the applicable safety standards and licensed practice');
		expect(t.pages).toBeGreaterThanOrEqual(2);
		// the caution footer on every page
		expect(text.split('Page ').length - 1).toBe(t.pages);
	});

	it('prints the ranked sensitivity table when the report has one, with its totals', async () => {
		const report = designSensitivity(designDocumentSchema.parse(specDoc)) as SensitivityReport;
		const pdf = await buildSignoffPdf({ rail: { name: 'S' }, revision: { label: 'r1' }, document: specDoc as never, response: buck, verification, sensitivity: report });
		const text = flat((await pdfText(pdf)).text);
		expect(text).toContain('What moves the phase margin');
		expect(text).toContain('Root-sum-square');
		// The largest row, as the review page's table prints it (verdict/sensitivityText.ts).
		for (const cell of sensitivityCells(report.rows[0]).slice(0, 2)) expect(text).toContain(cell);
	});

	it('prints the switching check kept with the revision (caution, PM and fc beside the averaged ones), or says it was not run', async () => {
		// The light-load boost of reference/switching, where ngspice's switching transient sides with the lower PM.
		const boost = JSON.parse(readFileSync(path.resolve('reference/switching/cases/boost-5v-12v-light.json'), 'utf8'));
		const result = switchingCheckOfDesign(boost);
		if ('error' in result) throw new Error(result.error.message);
		expect(result.status).toBe('differs');
		const kept = { engineVersion: '0', computedAt: '2026-01-02T03:04:05Z', requestedBy: null, freqHz: null, result };
		const pdf = await buildSignoffPdf({ rail: { name: 'S' }, revision: { label: 'r1' }, document: specDoc as never, response: buck, verification, switchingCheck: kept });
		const text = flat((await pdfText(pdf)).text);
		expect(text).toContain('Switching check');
		expect(text).toContain('The switching model differs from the averaged one');
		expect(text).toContain('Usual causes');
		for (const cell of switchingFigureRows(result).flat()) expect(text).toContain(cell);
		expect(text).toContain('run it again for current figures');
		const without = flat((await pdfText(await buildSignoffPdf({ rail: { name: 'S' }, revision: { label: 'r1' }, document: specDoc as never, response: buck, verification }))).text);
		expect(without).toContain('Not run for this revision');
	});

	it('an en dash and Ω survive in the PDF, and every verdict row is one line (failed before: "1 k ohm?1 M ohm", rows wrapped)', async () => {
		const doc = { ...specDoc, compensator: { kind: 'type2', parts: { r2: 220, c1: 220e-9, c2: 2.2e-9 }, series: null } };
		const v = verifyDesign(doc);
		if ('error' in v) throw new Error(v.error.message);
		expect(v.warnings.some((w) => w.code === 'resistor-out-of-range')).toBe(true);
		const pdf = await buildSignoffPdf({ rail: { name: 'R_LOW' }, revision: { label: 'r1' }, document: doc as never, response: analyse(doc), verification: v });
		const t = await pdfText(pdf);
		expect(flat(t.text)).toContain('practical 1 kΩ–1 MΩ range');
		expect(t.text).not.toMatch(/k ohm/);
		// Each row of the verdict table: check, worst value, target and status on one text line.
		const lines = t.text.split('\n');
		for (const r of v.rows) {
			const line = lines.find((l) => l.startsWith(VERDICT_LABELS[r.metric]) && l.includes(r.target));
			expect(line, `${r.metric} row on one line`).toBeDefined();
			expect(line).toContain(STATUS_WORDS[r.status]);
		}
	});

	it('above 60 V the caution box says so prominently; a row not verified yet says so instead of a verdict', async () => {
		const doc = load('boost-bank-12v-24v.json');
		doc.plant.vin = 48;
		doc.plant.vout = 72;
		const pdf = await buildSignoffPdf({ rail: { name: '72V_BUS' }, revision: { label: 'r1' }, document: doc, response: analyse(doc), verification: null });
		const text = flat((await pdfText(pdf)).text);
		expect(text).toContain('HIGH VOLTAGE: this rail works at 72 V, above 60 V DC.');
		expect(text).toContain('no stored verdict yet');
		expect(text).toContain('No review steps recorded');
		expect(REPORT_CAUTION).toMatch(/licensed practice\.$/);
	});

	it('the signed-off JSON fixes the network to the built parts, so importing it reproduces the stored nominal margins', () => {
		const out = exportSignedOffJson(specDoc, verification, { rail: '1V2_CORE', revision: 3, status: 'approved' });
		if (!out.ok) throw new Error(out.error.message);
		const file = JSON.parse(out.json);
		expect(file.signoff.verification.status).toBe(verification.status);
		expect(file.compensator.series).toBeNull();
		const back = importDesignJson(out.json);
		if (!back.ok) throw new Error(back.error.message);
		const again = analyse(back.document);
		const built = verification.parts.rounded ?? verification.parts.ideal;
		for (const k of ['r2', 'r3', 'c1', 'c2', 'c3'] as const) if (built[k] !== undefined) expect(again.compensator.ideal.parts[k]).toBe(built[k]);
		// Same network, same plant: the nominal margins of the stored verdict come back to 1e-9.
		expect(again.metrics.phaseMarginDeg! - verification.nominal.phaseMarginDeg!).toBeCloseTo(0, 9);
		expect(again.metrics.crossoverHz! / verification.nominal.crossoverHz! - 1).toBeCloseTo(0, 9);
	});

	it('the verdict CSV lists every check, then every corner, read back with papaparse', () => {
		const csv = verdictCsv(verification);
		const [checks, corners] = csv.split('\r\n\r\n');
		const head = Papa.parse<string[]>(checks.trim()).data;
		expect(head[0]).toEqual(['Check', 'Status', 'Worst value', 'Target', 'Corner', 'Reason']);
		expect(head[1].slice(0, 2)).toEqual(['verdict', verification.status]);
		expect(head.length).toBe(2 + verification.rows.length);
		const rows = Papa.parse<string[]>(corners.trim()).data;
		expect(rows.length).toBe(1 + verification.corners.count);
	});
});

describe('design JSON export and import', () => {
	it('round trip: export then import gives the same validated document', () => {
		const out = exportDesignJson(buckDoc);
		if (!out.ok) throw new Error(out.error.message);
		const back = importDesignJson(out.json);
		if (!back.ok) throw new Error(back.error.message);
		expect(back.document).toEqual(JSON.parse(out.json));
		expect(analyse(back.document).metrics).toEqual(buck.metrics);
	});

	it('import names the broken field', () => {
		const doc = structuredClone(buckDoc);
		doc.plant.capacitors[0].c = -1;
		delete doc.feedback.vref;
		const r = importDesignJson(JSON.stringify(doc));
		expect(r.ok).toBe(false);
		if (!r.ok) {
			expect(r.error.code).toBe('invalid-design');
			expect(r.error.fields['plant.capacitors.0.c']).toBe('must be > 0');
			expect(r.error.fields['feedback.vref']).toBeDefined();
		}
	});

	it('text that is not JSON, a newer schema version, and an oversized file are field errors, not throws', () => {
		const bad = importDesignJson('{"plant": ');
		expect(!bad.ok && bad.error.fields['(document)']).toMatch(/not valid JSON/);
		const newer = importDesignJson(JSON.stringify({ ...buckDoc, schemaVersion: 2 }));
		expect(!newer.ok && newer.error.fields.schemaVersion).toMatch(/reads up to 1/);
		const big = importDesignJson(' '.repeat(1024 * 1024 + 1));
		expect(!big.ok && big.error.fields['(document)']).toMatch(/larger than/);
	});
});

describe('fontkit and empty glyphs', () => {
	it("JetBrains Mono's last glyph, the empty spacer of its code ligatures, is measured instead of throwing", async () => {
		const { readFileSync: read } = await import('node:fs');
		const { create } = await import('fontkit');
		const { guardEmptyGlyphs } = await import('$lib/server/exports/fontkitEmptyGlyphs');
		guardEmptyGlyphs();
		const font = create(read(jetBrainsMonoTtf())) as import('fontkit').Font;
		const run = font.layout('fc 40k -> 60k');
		const last = font.getGlyph(font.numGlyphs - 1);
		expect(run.glyphs.map((g) => g.id)).toContain(last.id); // the ligature does substitute the spacer
		// A monospaced face: every glyph, the empty spacer included, advances the same width [published: JetBrains Mono, a monospaced typeface].
		expect(last.advanceWidth).toBe(font.getGlyph(font.glyphsForString('x')[0].id).advanceWidth);
		expect([last.cbox.width, last.cbox.height]).toEqual([0, 0]); // no outline, no box
	});
});
