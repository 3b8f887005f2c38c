/**
 * The sign-off report as PDF, generated on the server with pdfkit (no browser): rail and revision, the design
 * (stage, modulator, feedback, network), the Bode plot (PNG from the same SVG as the export), margins at every
 * corner against the targets, the parts list, engine warnings, the review trail and the cautions. Prose is set in
 * Helvetica (PDF standard font), values in JetBrains Mono (embedded TTF); a caution footer sits on every page.
 */
import PDFDocument from 'pdfkit';
import type { AnalysisResponse, DesignDocument } from '$lib/engine';
import { networkRoots, plotFromResponse } from './plotData';
import { renderBodePng } from './png';
import { drawableText } from './drawableText';
import { fontFor, registerReportFonts, useFontFor } from './pdfFonts';
import { formatDb, formatDeg, formatEng, formatHz } from './format';
import { PALETTES } from './theme';

export const REPORT_CAUTION =
	'Small-signal estimate; confirm margins and transients on hardware; above 60 V DC or at mains follow the applicable safety standards and licensed practice.';
export const HIGH_VOLTAGE_LIMIT = 60;

export interface ReportCorner {
	/** "Vin max, Iout min" … */
	label: string;
	vin?: number;
	iout?: number;
	response: AnalysisResponse;
	/** A verdict already decided by the caller; otherwise judged here against the targets. */
	verdict?: { status: 'pass' | 'caution' | 'fail'; reason: string };
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
	document: DesignDocument;
	/** The nominal analysis. */
	response: AnalysisResponse;
	corners?: ReportCorner[];
	targets?: { phaseMarginDeg?: number; gainMarginDb?: number };
	review?: ReviewEntry[];
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
const DEFAULT_TARGETS = { phaseMarginDeg: 45, gainMarginDb: 6 }; // [common practice: formulas §7.2]

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
	const targets = { ...DEFAULT_TARGETS, ...input.targets };
	const w = doc.page.width - doc.page.margins.left - doc.page.margins.right;
	const left = doc.page.margins.left;

	// Header.
	doc.font('Helvetica-Bold').fontSize(18).fillColor(INK).text('Loop sign-off report');
	doc.moveDown(0.2);
	const railLine = `Rail ${input.rail.name}${input.rail.board ? ` on board ${input.rail.board}` : ''}, revision ${input.revision.label}${input.revision.status ? ` (${input.revision.status})` : ''}`;
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

	// Design.
	heading(doc, 'Design');
	const p = d.plant;
	const bank = p.capacitors.map((c) => `${c.count} x ${formatEng(c.c, 'F', 4)} (ESR ${formatEng(c.esr, 'Ω', 4)}, ESL ${formatEng(c.esl, 'H', 4)})`).join(' + ');
	const op = input.response.operatingPoint;
	rows(doc, [
		['Stage', `${p.topology}, Vin ${formatEng(p.vin, 'V')}, Vout ${formatEng(p.vout, 'V')}, Iout ${formatEng(p.iout, 'A')}, fsw ${formatHz(p.fsw)}`],
		['Inductor', `L ${formatEng(p.inductor.l, 'H', 4)}, DCR ${formatEng(p.inductor.dcr, 'Ω', 4)}, rdsOn ${formatEng(p.rdsOn, 'Ω', 4)}`],
		['Bank', bank],
		['Operating point', `D ${op.duty.toFixed(3)}, efficiency ${(op.efficiency * 100).toFixed(1)} %, ripple ${formatEng(op.rippleCurrent, 'A')} p-p, ${op.mode.toUpperCase()}`],
		['Modulator', `Vramp ${formatEng(d.modulator.vramp, 'V')} p-p${d.modulator.feedForward ? ', input feed-forward' : ''}${d.modulator.delay > 0 ? `, delay ${formatEng(d.modulator.delay, 's')}` : ''}`],
		['Feedback', `Vref ${formatEng(d.feedback.vref, 'V', 4)}, R1 ${formatEng(d.feedback.r1, 'Ω', 4)}`],
		['Network', networkText(input.response, d)],
		['Plant features', featuresText(input.response)]
	]);
	doc.moveDown(0.6);

	// Plot.
	heading(doc, 'Loop gain, plant and network (nominal; corners faint)');
	const png =
		input.plotPng ??
		renderBodePng(
			plotFromResponse(input.response, { fswHz: p.fsw, corners: (input.corners ?? []).map((c) => ({ label: c.label, response: c.response })) }),
			{ width: 900, pixelWidth: 1500, roots: networkRoots(input.response) }
		);
	const imgH = w * (530 / 900);
	if (doc.y + imgH > doc.page.height - doc.page.margins.bottom) doc.addPage();
	doc.image(png, left, doc.y, { width: w });
	doc.y += imgH + 8;
	doc.x = left;

	// Margins at every corner.
	heading(doc, 'Margins');
	doc.font('Helvetica').fontSize(9).fillColor(MUTED).text(`Targets: phase margin at least ${targets.phaseMarginDeg}°, gain margin at least ${targets.gainMarginDb} dB.`);
	doc.moveDown(0.3);
	const cornerRows = [{ label: 'Nominal', vin: p.vin, iout: p.iout, response: input.response } as ReportCorner, ...(input.corners ?? [])];
	table(
		doc,
		['Case', 'Vin', 'Iout', 'fc', 'PM', 'GM', 'Verdict'],
		[150, 50, 50, 60, 50, 55, w - 415],
		cornerRows.map((c) => {
			const m = c.response.metrics;
			const v = c.verdict ?? judge(c.response, targets);
			return {
				cells: [c.label, c.vin !== undefined ? formatEng(c.vin, 'V') : '', c.iout !== undefined ? formatEng(c.iout, 'A') : '', formatHz(m.crossoverHz), formatDeg(m.phaseMarginDeg), formatDb(m.gainMarginDb), `${v.status}: ${v.reason}`],
				colour: STATUS_COLOUR[v.status]
			};
		})
	);
	if (!input.corners || input.corners.length === 0) {
		doc.font('Helvetica').fontSize(9).fillColor(MUTED).text('No corners were computed for this revision; only the nominal case is shown.');
	}
	doc.moveDown(0.6);

	// Parts.
	heading(doc, 'Parts list');
	const net = input.response.compensator.rounded ?? input.response.compensator.ideal;
	const partRows = Object.entries(net.parts).map(([name, value]) => ({ cells: [name.toUpperCase(), partValue(name, value), partRole(name)] }));
	partRows.push({ cells: ['L', formatEng(p.inductor.l, 'H', 4), `power inductor, DCR ${formatEng(p.inductor.dcr, 'Ω', 4)}`] });
	p.capacitors.forEach((c, i) => partRows.push({ cells: [`COUT${i + 1}`, `${c.count} x ${formatEng(c.c, 'F', 4)}`, `output bank branch ${i + 1}, ESR ${formatEng(c.esr, 'Ω', 4)} each`] }));
	table(doc, ['Part', 'Value', 'Role'], [70, 120, w - 190], partRows);
	doc.moveDown(0.6);

	// Warnings.
	if (input.response.warnings.length > 0) {
		heading(doc, 'Engine warnings');
		doc.fontSize(9).fillColor(INK);
		for (const wn of input.response.warnings) doc.text(useFontFor(doc, 'prose', `- ${wn.message}`), { width: w });
		doc.moveDown(0.6);
	}

	// Review trail.
	heading(doc, 'Review trail');
	if (input.review && input.review.length > 0) {
		table(
			doc,
			['When', 'Who', 'Action', 'Note'],
			[105, 100, 95, w - 300],
			input.review.map((e) => ({ cells: [dateText(e.at), e.who, e.action, `${e.freqHz !== undefined ? `at ${formatHz(e.freqHz)}: ` : ''}${e.note ?? ''}`] }))
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

/** Pass when both margins meet the targets; caution within 5° / 2 dB below; fail otherwise or when unstable. */
function judge(r: AnalysisResponse, t: { phaseMarginDeg: number; gainMarginDb: number }): { status: 'pass' | 'caution' | 'fail'; reason: string } {
	const m = r.metrics;
	if (m.closedLoopStable === false) return { status: 'fail', reason: 'closed loop unstable' };
	if (m.phaseMarginDeg === null) return { status: 'fail', reason: 'no crossover found' };
	const pmShort = t.phaseMarginDeg - m.phaseMarginDeg;
	const gmShort = m.gainMarginDb === null ? -Infinity : t.gainMarginDb - m.gainMarginDb;
	if (pmShort <= 0 && gmShort <= 0) return { status: 'pass', reason: 'margins meet the targets' };
	const why = [pmShort > 0 ? `PM ${pmShort.toFixed(1)}° below target` : '', gmShort > 0 ? `GM ${gmShort.toFixed(1)} dB below target` : ''].filter(Boolean).join(', ');
	return { status: pmShort <= 5 && gmShort <= 2 ? 'caution' : 'fail', reason: why };
}

function networkText(r: AnalysisResponse, d: DesignDocument): string {
	const kind = { type1: 'Type I', type2: 'Type II', type3: 'Type III', 'type2-ota': 'Type II (OTA)' }[r.compensator.kind] ?? r.compensator.kind;
	const net = r.compensator.rounded ?? r.compensator.ideal;
	const zeros = net.zerosHz.filter((f) => f > 0).map((f) => formatHz(f)).join(', ') || 'none';
	const poles = net.polesHz.filter((f) => f > 0).map((f) => formatHz(f)).join(', ') || 'none';
	const how = d.compensator.parts ? 'parts as entered' : `placed by ${d.compensator.target?.method}`;
	const rounded = r.compensator.rounded ? ', rounded to series values' : '';
	return `${kind}, ${how}${rounded}; zeros ${zeros}; poles ${poles}`;
}

function featuresText(r: AnalysisResponse): string {
	const f = r.features;
	const parts = [`f0 ${formatHz(f.f0Hz)}, Q ${f.q.toFixed(2)}`];
	if (f.esrZeroHz.length) parts.push(`ESR zero ${f.esrZeroHz.map((x) => formatHz(x)).join(', ')}`);
	if (f.rhpZeroHz !== null) parts.push(`RHP zero ${formatHz(f.rhpZeroHz)}`);
	return parts.join('; ');
}

function partValue(name: string, value: number): string {
	if (name.startsWith('r')) return formatEng(value, 'Ω', 4);
	if (name.startsWith('c')) return formatEng(value, 'F', 4);
	if (name === 'gm') return formatEng(value, 'S', 4);
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
	const d = typeof x === 'string' ? new Date(x) : x;
	return Number.isNaN(d.getTime()) ? String(x) : d.toISOString().replace('T', ' ').slice(0, 16) + ' UTC';
}
