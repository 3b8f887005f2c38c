/**
 * The sign-off report as PDF, generated on the server with pdfkit (no browser): rail and revision, the stored
 * verdict (the same figures every screen prints), the verification spec it was judged with, the design, the Bode
 * plot (with the corners that set the verdict faint), the parts (ideal, rounded, series), every warning the engine
 * raised at any corner, the review trail and the cautions. Prose is set in Helvetica (PDF standard font), values
 * and verdict figures in JetBrains Mono (embedded TTF, so °, µ and − survive); a caution footer sits on every page.
 */
import PDFDocument from 'pdfkit';
import type { AnalysisResponse, DesignDocument } from '$lib/engine';
import type { Verification } from '$lib/engine/verify/types';
import { formatDb, formatDeg, formatEng, formatPart, formatPercent } from '$lib/units/format';
import { STATUS_WORDS, VERDICT_LABELS, verdictValueText } from '$lib/engine/verify/text';
import { verdictFigures, verdictLine } from '$lib/verdict/figures';
import { networkRoots, plotFromResponse } from './plotData';
import { renderBodePng } from './png';
import { drawableText } from './drawableText';
import { fontFor, registerReportFonts, useFontFor } from './pdfFonts';
import { PALETTES } from './theme';
import { formatDateTime } from '../../text/dates';
import { loopStatusText } from '../../text/status';
import { modulatorText } from '../../text/controlMode';
import { warningWhereText } from '../../verdict/cornerList';
import { SENSITIVITY_HEADER, sensitivityCells, sensitivityTotals } from '../../verdict/sensitivityText';
import type { SensitivityReport } from '../../engine/sensitivity';
import { ENGINE_VERSION } from '../../engine/version';
import {
	SWITCHING_HEADER,
	storedCheckText,
	switchingFigureRows,
	switchingLinearityText,
	switchingOrbitText,
	switchingVerdictText,
	type StoredSwitchingCheck
} from '../../verdict/switchingText';

export const REPORT_CAUTION =
	'Small-signal estimate; confirm margins and transients on hardware; above 60 V DC or at mains follow the applicable safety standards and licensed practice.';
export const HIGH_VOLTAGE_LIMIT = 60;

/** A corner's loop gain on the nominal's grid, drawn faint behind the nominal. */
export interface ReportCornerTrace {
	label: string;
	magDb: ArrayLike<number>;
	phaseDeg: ArrayLike<number>;
}

export interface ReviewEntry {
	at: string | Date;
	who: string;
	/** "requested review", "commented", "approved", "requested changes" … */
	action: string;
	note?: string;
	/** A comment pinned to a frequency on the plot. */
	freqHz?: number;
}

export interface SignoffReportInput {
	rail: { name: string; board?: string; notes?: string };
	revision: { label: string; author?: string; createdAt?: string | Date; status?: string };
	/** The stored design document, spec sections included. */
	document: DesignDocument;
	/** The nominal analysis (plot, operating point, network). */
	response: AnalysisResponse;
	/** The verdict stored with the revision; null only for a row not verified yet. */
	verification: Verification | null;
	cornerTraces?: ReportCornerTrace[];
	/** The ranked sensitivities of the margins to every part (engine/sensitivity). */
	sensitivity?: SensitivityReport | null;
	review?: ReviewEntry[];
	/** The switching check kept with the revision (services/switching-check.ts), or null when none was run. */
	switchingCheck?: StoredSwitchingCheck | null;
	/** A plot image to use instead of rendering one from the response. */
	plotPng?: Buffer;
	generatedAt?: Date;
}

export interface PdfOptions {
	/** Deflate page streams [true]; false keeps them readable (debugging). */
	compress?: boolean;
}

const INK = PALETTES.light.ink;
const MUTED = PALETTES.light.muted;
const RULE = PALETTES.light.grid;
const STATUS_COLOUR = { pass: PALETTES.light.pass, caution: PALETTES.light.caution, fail: PALETTES.light.fail };

export function buildSignoffPdf(input: SignoffReportInput, options: PdfOptions = {}): Promise<Buffer> {
	const doc = new PDFDocument({
		size: 'A4',
		margins: { top: 50, bottom: 60, left: 50, right: 50 },
		compress: options.compress ?? true,
		bufferPages: true,
		info: {
			Title: drawableText(`Sign-off report: ${input.rail.name} ${input.revision.label}`),
			Creator: 'Loopwright',
			Producer: 'Loopwright (pdfkit)',
			CreationDate: input.generatedAt ?? new Date()
		}
	});
	registerReportFonts(doc);
	const chunks: Buffer[] = [];
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('data', (c: Buffer) => chunks.push(c));
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});

	const d = input.document;
	const v = input.verification;
	const w = doc.page.width - doc.page.margins.left - doc.page.margins.right;
	const left = doc.page.margins.left;

	// Header.
	doc.font('Helvetica-Bold').fontSize(18).fillColor(INK).text('Loop sign-off report');
	doc.moveDown(0.2);
	const railLine = `Rail ${input.rail.name}${input.rail.board ? ` on board ${input.rail.board}` : ''}, revision ${input.revision.label}${input.revision.status ? ` (${loopStatusText(input.revision.status)})` : ''}`;
	doc.fontSize(11).fillColor(INK).text(useFontFor(doc, 'prose', railLine));
	const meta = [
		input.revision.author ? `author ${input.revision.author}` : null,
		input.revision.createdAt ? `saved ${dateText(input.revision.createdAt)}` : null,
		`report generated ${dateText(input.generatedAt ?? new Date())}`
	].filter(Boolean);
	doc.fillColor(MUTED).fontSize(9).text(useFontFor(doc, 'prose', meta.join(' · ')));
	if (input.rail.notes) doc.fillColor(INK).fontSize(10).text(useFontFor(doc, 'prose', input.rail.notes, { multiline: true }));
	doc.moveDown(0.6);

	// Cautions, prominent above 60 V.
	const highVoltage = Math.max(d.plant.vin, d.plant.vout) > HIGH_VOLTAGE_LIMIT;
	cautionBox(doc, highVoltage, d, left, w);

	// The stored verdict, first: what the reviewer signs.
	heading(doc, 'Verdict');
	if (v) {
		const f = verdictFigures(v);
		doc.fontSize(11).fillColor(STATUS_COLOUR[v.status]).text(useFontFor(doc, 'mono-bold', `${v.status.toUpperCase()}: ${v.summary}`), { width: w });
		doc.moveDown(0.2);
		doc.fontSize(9).fillColor(INK).text(useFontFor(doc, 'mono', `Worst case over ${f.corners} corners: ${verdictLine(f)}`), { width: w });
		if (v.spread) doc.fontSize(8.5).fillColor(MUTED).text(useFontFor(doc, 'mono', `Spread yield ${f.yield} ${f.yieldOf}`), { width: w });
		doc.font('Helvetica').fontSize(8).fillColor(MUTED).text(`Engine version ${v.engineVersion}; computed when the revision was saved and stored with it.`);
		doc.moveDown(0.3);
		// One line per check (its corner and reason follow in full width below): a reason naming a
		// tolerance corner is long, and in a table cell it wrapped every row onto three lines.
		table(
			doc,
			['Check', 'Worst', 'Target', 'Status'],
			[95, 75, w - 230, 60],
			v.rows.map((r) => ({ cells: [VERDICT_LABELS[r.metric], verdictValueText(r), r.target, STATUS_WORDS[r.status]], colour: STATUS_COLOUR[r.status] }))
		);
		doc.moveDown(0.3);
		for (const r of v.rows) doc.fontSize(8).fillColor(MUTED).text(useFontFor(doc, 'mono', `${VERDICT_LABELS[r.metric]}: ${r.reason}`), { width: w });
	} else {
		doc.font('Helvetica').fontSize(9).fillColor(STATUS_COLOUR.fail).text('This revision has no stored verdict yet; re-verify it (npm run reverify) before signing it off.');
	}
	doc.moveDown(0.6);

	// The spec it was judged with (stored with the revision).
	heading(doc, 'Verification spec');
	rows(doc, specRows(d, v));
	doc.moveDown(0.6);

	// Design.
	heading(doc, 'Design');
	const p = d.plant;
	const bank = p.capacitors.map((c) => `${c.count} x ${formatPart(c.c, 'F')} (ESR ${formatPart(c.esr, 'Ω')}, ESL ${formatPart(c.esl, 'H')})`).join(' + ');
	const op = input.response.operatingPoint;
	rows(doc, [
		['Stage', `${p.topology}, Vin ${formatEng(p.vin, 'V')}, Vout ${formatEng(p.vout, 'V')}, Iout ${formatEng(p.iout, 'A')}, fsw ${formatEng(p.fsw, 'Hz')}`],
		['Inductor', `L ${formatPart(p.inductor.l, 'H')}, DCR ${formatPart(p.inductor.dcr, 'Ω')}, rdsOn ${formatPart(p.rdsOn, 'Ω')}`],
		['Bank', bank],
		['Operating point', `D ${op.duty.toFixed(3)}, efficiency ${(op.efficiency * 100).toFixed(1)} %, ripple ${formatEng(op.rippleCurrent, 'A')} p-p, ${op.mode.toUpperCase()}`],
		['Modulator', modulatorText(d.modulator, input.response.features.currentMode)],
		['Feedback', `Vref ${formatPart(d.feedback.vref, 'V')}, R1 ${formatPart(d.feedback.r1, 'Ω')}`],
		['Network', networkText(input.response, d)],
		['Plant features', featuresText(input.response)]
	]);
	doc.moveDown(0.6);

	// Plot.
	heading(doc, 'Loop gain, plant and network (nominal; the corners that set the verdict faint)');
	const png =
		input.plotPng ??
		renderBodePng(
			plotFromResponse(input.response, { fswHz: p.fsw, cornerLoops: input.cornerTraces ?? [] }),
			{ width: 900, pixelWidth: 1500, roots: networkRoots(input.response) }
		);
	const imgH = w * (530 / 900);
	if (doc.y + imgH > doc.page.height - doc.page.margins.bottom) doc.addPage();
	doc.image(png, left, doc.y, { width: w });
	doc.y += imgH + 8;
	doc.x = left;

	// Parts: as placed (ideal), as built (rounded to the series) and the series.
	heading(doc, 'Parts list');
	const ideal = v?.parts.ideal ?? (input.response.compensator.ideal.parts as Record<string, number>);
	const rounded = v ? v.parts.rounded : ((input.response.compensator.rounded?.parts as Record<string, number> | undefined) ?? null);
	const series = v?.parts.series ?? null;
	if (series) doc.font('Helvetica').fontSize(9).fillColor(MUTED).text(`Rounded to ${series.resistors ?? 'exact'} resistors and ${series.capacitors ?? 'exact'} capacitors; the built network is the rounded one.`);
	else doc.font('Helvetica').fontSize(9).fillColor(MUTED).text('No series rounding: the network is built with the ideal values.');
	doc.moveDown(0.2);
	const partRows = Object.entries(ideal).map(([name, value]) => ({ cells: [name.toUpperCase(), partValue(name, value), rounded?.[name] !== undefined ? partValue(name, rounded[name]) : '–', partRole(name)] }));
	partRows.push({ cells: ['L', formatPart(p.inductor.l, 'H'), formatPart(p.inductor.l, 'H'), `power inductor, DCR ${formatPart(p.inductor.dcr, 'Ω')}`] });
	p.capacitors.forEach((c, i) => partRows.push({ cells: [`COUT${i + 1}`, `${c.count} x ${formatPart(c.c, 'F')}`, `${c.count} x ${formatPart(c.c, 'F')}`, `output bank branch ${i + 1}, ESR ${formatPart(c.esr, 'Ω')} each`] }));
	table(doc, ['Part', 'Ideal', 'Built', 'Role'], [60, 90, 90, w - 240], partRows);
	doc.moveDown(0.6);

	// Which part moves the margins most (linearised at the nominal point; the corners are exact).
	if (input.sensitivity) {
		heading(doc, 'What moves the phase margin');
		doc.font('Helvetica').fontSize(9).fillColor(MUTED).text(`Change of each figure with one part at its tolerance (${input.sensitivity.rankedBy === 'tolerance' ? 'ranked by it' : 'no tolerances: ranked per +10 %'}), linearised at the nominal operating point.`, { width: w });
		doc.moveDown(0.2);
		const rows = input.sensitivity.rows.map((r) => ({ cells: sensitivityCells(r) }));
		for (const t of sensitivityTotals(input.sensitivity)) rows.push({ cells: [t.label, '', '', ...t.cells] });
		table(doc, [...SENSITIVITY_HEADER], [w - 400, 50, 80, 80, 90, 100], rows);
		doc.moveDown(0.6);
	}

	// The switching model beside the averaged one, when a check was kept with the revision.
	heading(doc, 'Switching check');
	const kept = input.switchingCheck;
	if (kept) {
		const r = kept.result;
		const verdict = switchingVerdictText(r);
		doc.fontSize(9).fillColor(verdict.tone === 'pass' ? STATUS_COLOUR.pass : STATUS_COLOUR.caution).text(useFontFor(doc, 'prose', verdict.text), { width: w });
		doc.moveDown(0.2);
		if (r.status !== 'not-run') table(doc, [...SWITCHING_HEADER], [110, 110, 110, w - 330], switchingFigureRows(r).map((cells) => ({ cells })));
		doc.moveDown(0.2);
		for (const line of [switchingOrbitText(r), ...r.notes, switchingLinearityText(r)]) {
			if (line) doc.fontSize(8).fillColor(MUTED).text(useFontFor(doc, 'prose', line), { width: w });
		}
		doc.font('Helvetica').fontSize(8).fillColor(MUTED).text(storedCheckText(kept, ENGINE_VERSION, dateText(kept.computedAt)), { width: w });
	} else {
		doc.font('Helvetica').fontSize(9).fillColor(MUTED).text('Not run for this revision: the margins above are from the averaged model only. Run it from the review page to keep it with the revision.', { width: w });
	}
	doc.moveDown(0.6);

	// Every warning the engine raised, at any corner.
	heading(doc, 'Engine warnings');
	const warnings = v ? v.warnings.map((wn) => `${wn.message} ${warningWhereText(wn.corners, v.corners.count)}`.trim()) : input.response.warnings.map((wn) => wn.message);
	if (warnings.length) for (const text of warnings) doc.fontSize(8.5).fillColor(INK).text(useFontFor(doc, 'mono', `- ${text}`), { width: w });
	else doc.font('Helvetica').fontSize(9).fillColor(MUTED).text('None at any corner.');
	doc.moveDown(0.6);

	// Review trail.
	heading(doc, 'Review trail');
	if (input.review && input.review.length > 0) {
		table(
			doc,
			['When', 'Who', 'Action', 'Note'],
			[105, 100, 95, w - 300],
			input.review.map((e) => ({ cells: [dateText(e.at), e.who, e.action, `${e.freqHz !== undefined ? `at ${formatEng(e.freqHz, 'Hz')}: ` : ''}${e.note ?? ''}`] }))
		);
	} else {
		doc.font('Helvetica').fontSize(9).fillColor(MUTED).text('No review steps recorded for this revision.');
	}
	doc.moveDown(0.6);
	heading(doc, 'Cautions');
	doc.font('Helvetica').fontSize(10).fillColor(INK).text(REPORT_CAUTION, { width: w });

	// Footer on every page.
	const range = doc.bufferedPageRange();
	for (let i = range.start; i < range.start + range.count; i++) {
		doc.switchToPage(i);
		const y = doc.page.height - doc.page.margins.bottom + 18;
		doc.font('Helvetica').fontSize(7.5).fillColor(MUTED);
		doc.text(`${REPORT_CAUTION}  Page ${i + 1} of ${range.count}.`, left, y, { width: w, lineBreak: true, height: 30 });
	}
	doc.end();
	return done;
}

function cautionBox(doc: PDFKit.PDFDocument, high: boolean, d: DesignDocument, left: number, w: number) {
	const text = high
		? `HIGH VOLTAGE: this rail works at ${Math.max(d.plant.vin, d.plant.vout)} V, above 60 V DC. ${REPORT_CAUTION}`
		: REPORT_CAUTION;
	doc.font(high ? 'Helvetica-Bold' : 'Helvetica').fontSize(high ? 10.5 : 9.5);
	const h = doc.heightOfString(text, { width: w - 20 }) + 14;
	const top = doc.y;
	const colour = high ? STATUS_COLOUR.fail : STATUS_COLOUR.caution;
	doc.save().lineWidth(high ? 1.5 : 0.8).strokeColor(colour).rect(left, top, w, h).stroke().restore();
	doc.fillColor(high ? colour : INK).text(text, left + 10, top + 7, { width: w - 20 });
	doc.x = left;
	doc.y = top + h + 10;
}

function heading(doc: PDFKit.PDFDocument, text: string) {
	if (doc.y > doc.page.height - doc.page.margins.bottom - 60) doc.addPage();
	doc.font('Helvetica-Bold').fontSize(12).fillColor(INK).text(text);
	const y = doc.y + 2;
	doc.save().lineWidth(0.5).strokeColor(RULE).moveTo(doc.page.margins.left, y).lineTo(doc.page.width - doc.page.margins.right, y).stroke().restore();
	doc.moveDown(0.4);
}

/** Label / value lines: labels in Helvetica, values in mono. */
function rows(doc: PDFKit.PDFDocument, items: [string, string][]) {
	const left = doc.page.margins.left;
	const w = doc.page.width - left - doc.page.margins.right;
	for (const [label, value] of items) {
		const y = doc.y;
		doc.font('Helvetica').fontSize(9).fillColor(MUTED).text(label, left, y, { width: 95 });
		doc.fontSize(8.5).fillColor(INK).text(useFontFor(doc, 'mono', value), left + 100, y, { width: w - 100 });
		doc.x = left;
	}
}

function table(doc: PDFKit.PDFDocument, header: string[], widths: number[], body: { cells: string[]; colour?: string }[]) {
	const left = doc.page.margins.left;
	const draw = (cells: string[], bold: boolean, colour?: string) => {
		doc.fontSize(bold ? 9 : 8.5);
		// Each cell in the face that can show it, measured in that same face.
		const set = cells.map((c) => fontFor(bold ? 'prose-bold' : 'mono', c || ' '));
		const h = Math.max(...set.map((c, i) => doc.font(c.font).heightOfString(c.text || ' ', { width: widths[i] - 6 }))) + 4;
		if (doc.y + h > doc.page.height - doc.page.margins.bottom) doc.addPage();
		const y = doc.y;
		let x = left;
		set.forEach((c, i) => {
			const last = i === set.length - 1;
			doc.font(c.font).fillColor(last && colour ? colour : INK).text(c.text, x, y + 2, { width: widths[i] - 6 });
			x += widths[i];
		});
		doc.y = y + h;
		doc.save().lineWidth(0.4).strokeColor(RULE).moveTo(left, doc.y).lineTo(x, doc.y).stroke().restore();
		doc.x = left;
	};
	draw(header, true);
	for (const row of body) draw(row.cells, false, row.colour);
}

/** The verification spec as label / value lines: targets, operating ranges, tolerances, spread settings. */
function specRows(d: DesignDocument, v: Verification | null): [string, string][] {
	const t = v?.targets;
	const out: [string, string][] = [];
	if (t) {
		const fcRange = t.crossoverHz ? `, fc ${t.crossoverHz.min !== undefined ? `≥ ${formatEng(t.crossoverHz.min, 'Hz')}` : ''}${t.crossoverHz.min !== undefined && t.crossoverHz.max !== undefined ? ' and ' : ''}${t.crossoverHz.max !== undefined ? `≤ ${formatEng(t.crossoverHz.max, 'Hz')}` : ''}` : '';
		out.push(['Targets', `PM ≥ ${formatDeg(t.phaseMarginDeg)}, GM ≥ ${formatDb(t.gainMarginDb)}, fc ≤ ${t.maxCrossoverFraction} × fsw${fcRange}`]);
	}
	const c = d.corners;
	const range = (r: { min: number; max: number } | undefined, unit: 'V' | 'A', nom: number) => (r ? `${formatEng(r.min, unit)} to ${formatEng(r.max, unit)} (nominal ${formatEng(nom, unit)})` : `${formatEng(nom, unit)} only`);
	out.push(['Operating ranges', `Vin ${range(c?.vin, 'V', d.plant.vin)}; Iout ${range(c?.iout, 'A', d.plant.iout)}`]);
	const tol = Object.entries(d.tolerances ?? {}).filter(([, x]) => x && x.tol > 0);
	out.push(['Tolerances', tol.length ? tol.map(([k, x]) => `${k} ±${formatPercent(x!.tol)} ${x!.dist}`).join(', ') : 'none']);
	if (v) out.push(['Corners', `${v.corners.count} (${v.corners.mode === 'exhaustive' ? 'every combination' : 'each part alone plus the linearised worst combination'})`]);
	out.push(['Spread', d.spread ? `${d.spread.samples} samples, seed ${d.spread.seed}` : 'not run']);
	return out;
}

function networkText(r: AnalysisResponse, d: DesignDocument): string {
	const kind = { type1: 'Type I', type2: 'Type II', type3: 'Type III', 'type2-ota': 'Type II (OTA)' }[r.compensator.kind] ?? r.compensator.kind;
	const net = r.compensator.rounded ?? r.compensator.ideal;
	const zeros = net.zerosHz.filter((f) => f > 0).map((f) => formatEng(f, 'Hz')).join(', ') || 'none';
	const poles = net.polesHz.filter((f) => f > 0).map((f) => formatEng(f, 'Hz')).join(', ') || 'none';
	const how = d.compensator.parts ? 'parts as entered' : `placed by ${d.compensator.target?.method}`;
	const rounded = r.compensator.rounded ? ', rounded to series values' : '';
	return `${kind}, ${how}${rounded}; zeros ${zeros}; poles ${poles}`;
}

function featuresText(r: AnalysisResponse): string {
	const f = r.features;
	const parts = [`f0 ${formatEng(f.f0Hz, 'Hz')}, Q ${f.q.toFixed(2)}`];
	if (f.esrZeroHz.length) parts.push(`ESR zero ${f.esrZeroHz.map((x) => formatEng(x, 'Hz')).join(', ')}`);
	if (f.rhpZeroHz !== null) parts.push(`RHP zero ${formatEng(f.rhpZeroHz, 'Hz')}`);
	// Peak current mode: the plant is Gvc, whose low-frequency pole replaces the LC pair's role.
	if (f.currentMode) parts.push(`Gvc low-frequency pole ${formatEng(f.currentMode.lowFrequencyPoleHz, 'Hz')}, Sn ${formatEng(f.currentMode.sn, 'V/s')}, Sf ${formatEng(f.currentMode.sf, 'V/s')}`);
	return parts.join('; ');
}

function partValue(name: string, value: number): string {
	if (name.startsWith('r')) return formatPart(value, 'Ω');
	if (name.startsWith('c')) return formatPart(value, 'F');
	if (name === 'gm') return formatPart(value, 'S');
	return String(value);
}

function partRole(name: string): string {
	const roles: Record<string, string> = {
		r1: 'input resistor, divider top',
		rb: 'divider bottom',
		r2: 'feedback branch, sets the zero with C1',
		c1: 'feedback branch, in series with R2',
		c2: 'across the feedback branch (high-frequency pole)',
		r3: 'in series with C3, across R1',
		c3: 'across R1 with R3 (second zero)',
		gm: 'error-amplifier transconductance',
		ro: 'error-amplifier output resistance'
	};
	return roles[name] ?? '';
}

function dateText(x: string | Date): string {
	return formatDateTime(x, String(x));
}
