/**
 * Server-side Bode plot as an SVG string, with the design screen's look: magnitude (dB) stacked over phase (deg) on
 * one shared log-frequency axis, the paper palette (or its dark twin), JetBrains Mono, dashes as well as colours,
 * corners thin and faint, the crossover and gain-margin chips, poles × and zeros ○ on a lane, the band above fsw/2
 * hatched. d3-scale and d3-shape compute positions; every coordinate is finite (non-finite samples are gaps).
 */
import { scaleLinear, scaleLog, type ScaleLinear, type ScaleLogarithmic } from 'd3-scale';
import { line } from 'd3-shape';
import { drawableText } from './drawableText';
import { formatDb, formatDeg, formatEng } from '$lib/units/format';
import type { ExportPlot, ExportTrace, ExportTraceKind } from './plotTypes';
import { plantTraceLabel } from '$lib/text/controlMode';
import { PALETTES, PLOT_FONT_FAMILY, type Palette, type ThemeName } from './theme';

export interface BodeSvgOptions {
	/** Pixel width of the drawing [900]. */
	width?: number;
	theme?: ThemeName;
	/** Poles (×) and zeros (○) of the network, drawn on the lane between the panels. */
	roots?: { type: 'pole' | 'zero'; freqHz: number }[];
}

const MARGIN = { left: 58, right: 18, top: 30 };
const MAG_H = 236;
const LANE_H = 34;
const PHASE_H = 196;
const AXIS_H = 34;
export const BODE_SVG_HEIGHT = MARGIN.top + MAG_H + LANE_H + PHASE_H + AXIS_H;

const DASH: Record<ExportTraceKind, string> = { loop: '', plant: '7 4', compensator: '10 3 2 3' };
const LABEL: Record<Exclude<ExportTraceKind, 'plant'>, string> = { loop: 'Loop gain T', compensator: 'Network Gc' };
const ORDER: ExportTraceKind[] = ['compensator', 'plant', 'loop']; // loop last, on top

export function renderBodeSvg(plot: ExportPlot, options: BodeSvgOptions = {}): string {
	const pal = PALETTES[options.theme ?? 'light'];
	const width = Math.max(320, Math.round(options.width ?? 900));
	const innerW = width - MARGIN.left - MARGIN.right;
	const freq = plot.freqHz;
	const n = freq.length;
	const fLo = n > 0 && freq[0] > 0 ? freq[0] : 10;
	const fHi = n > 1 && freq[n - 1] > fLo ? freq[n - 1] : fLo * 1e5;
	const x = scaleLog().domain([fLo, fHi]).range([0, innerW]);
	const magDom = magDomain(plot);
	const phaseDom = phaseDomain(plot);
	const yMag = scaleLinear().domain(magDom).range([MAG_H, 0]);
	const yPhase = scaleLinear().domain(phaseDom).range([PHASE_H, 0]);
	const laneTop = MARGIN.top + MAG_H;
	const phaseTop = laneTop + LANE_H;
	const ticks = logTicks(fLo, fHi);
	const out: string[] = [];
	const font = `font-family="${PLOT_FONT_FAMILY}, monospace"`;

	out.push(
		`<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${BODE_SVG_HEIGHT}" viewBox="0 0 ${width} ${BODE_SVG_HEIGHT}" ${font} font-size="11">`,
		`<title>${esc(plot.title ?? 'Bode plot')}</title>`,
		'<defs>',
		`<clipPath id="clip-mag"><rect width="${r(innerW)}" height="${MAG_H}"/></clipPath>`,
		`<clipPath id="clip-phase"><rect width="${r(innerW)}" height="${PHASE_H}"/></clipPath>`,
		`<pattern id="hatch" width="7" height="7" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="7" stroke="${pal.grid}" stroke-width="2.5"/></pattern>`,
		'</defs>',
		`<rect width="${width}" height="${BODE_SVG_HEIGHT}" fill="${pal.page}"/>`
	);
	if (plot.title) out.push(`<text x="${MARGIN.left}" y="18" fill="${pal.ink}" font-size="13" font-weight="bold">${esc(plot.title)}</text>`);

	const limitX = plot.modelLimitHz != null && plot.modelLimitHz < fHi ? x(Math.max(fLo, plot.modelLimitHz)) : null;

	// Magnitude panel.
	out.push(`<g transform="translate(${MARGIN.left},${MARGIN.top})">`);
	if (limitX !== null) {
		out.push(`<rect x="${r(limitX)}" y="0" width="${r(innerW - limitX)}" height="${MAG_H}" fill="url(#hatch)" opacity="0.8"/>`);
		const note = innerW - limitX > 260 ? "beyond the averaged model's reach (f &gt; fsw/2)" : 'f &gt; fsw/2';
		out.push(`<text x="${r(innerW - 4)}" y="${MAG_H - 6}" text-anchor="end" font-size="9" fill="${pal.muted}">${note}</text>`);
	}
	out.push(grid(x, yMag, ticks, stepTicks(magDom, [20, 40, 60], 8), MAG_H, innerW, pal, ' dB', 0));
	out.push('<g clip-path="url(#clip-mag)">');
	out.push(traces(plot, x, yMag, 'mag', pal));
	out.push(measuredDots(plot, x, yMag, 'mag', pal));
	out.push('</g>');
	if (plot.crossover && inRange(plot.crossover.freqHz, fLo, fHi)) {
		const cx = x(plot.crossover.freqHz);
		out.push(`<line x1="${r(cx)}" y1="0" x2="${r(cx)}" y2="${MAG_H}" stroke="${pal.ink}" stroke-width="0.75" stroke-dasharray="2 3"/>`);
		out.push(`<circle cx="${r(cx)}" cy="${r(yMag(0))}" r="3.5" fill="${pal.ink}"/>`);
		out.push(chip(`fc ${formatEng(plot.crossover.freqHz, 'Hz')} · PM ${formatDeg(plot.crossover.phaseMarginDeg)}`, cx, 18, innerW, pal));
	}
	out.push('</g>');
	out.push(`<g transform="translate(${MARGIN.left},0)">${legend(plot, innerW, pal)}</g>`);

	// Lane of poles and zeros.
	out.push(`<g transform="translate(${MARGIN.left},${laneTop})">`);
	out.push(`<line x1="0" y1="${LANE_H / 2}" x2="${r(innerW)}" y2="${LANE_H / 2}" stroke="${pal.grid}"/>`);
	for (const root of options.roots ?? []) {
		if (!inRange(root.freqHz, fLo, fHi)) continue;
		const cx = r(x(root.freqHz));
		const cy = LANE_H / 2;
		if (root.type === 'zero') out.push(`<circle cx="${cx}" cy="${cy}" r="4.5" fill="${pal.page}" stroke="${pal.comp}" stroke-width="1.5"/>`);
		else out.push(`<path d="M${r(+cx - 4)},${cy - 4}L${r(+cx + 4)},${cy + 4}M${r(+cx - 4)},${cy + 4}L${r(+cx + 4)},${cy - 4}" stroke="${pal.comp}" stroke-width="1.5"/>`);
	}
	out.push('</g>');

	// Phase panel.
	out.push(`<g transform="translate(${MARGIN.left},${phaseTop})">`);
	if (limitX !== null) out.push(`<rect x="${r(limitX)}" y="0" width="${r(innerW - limitX)}" height="${PHASE_H}" fill="url(#hatch)" opacity="0.8"/>`);
	out.push(grid(x, yPhase, ticks, stepTicks(phaseDom, [45, 90, 180], 7), PHASE_H, innerW, pal, '°', -180));
	out.push('<g clip-path="url(#clip-phase)">');
	out.push(traces(plot, x, yPhase, 'phase', pal));
	out.push(measuredDots(plot, x, yPhase, 'phase', pal));
	out.push('</g>');
	if (plot.crossover && inRange(plot.crossover.freqHz, fLo, fHi)) {
		const cx = x(plot.crossover.freqHz);
		out.push(`<line x1="${r(cx)}" y1="0" x2="${r(cx)}" y2="${PHASE_H}" stroke="${pal.ink}" stroke-width="0.75" stroke-dasharray="2 3"/>`);
	}
	if (plot.gainMargin && inRange(plot.gainMargin.freqHz, fLo, fHi)) {
		const gx = x(plot.gainMargin.freqHz);
		const gy = yPhase(-180);
		if (Number.isFinite(gy)) out.push(`<circle cx="${r(gx)}" cy="${r(gy)}" r="3.5" fill="${pal.ink}"/>`);
		out.push(chip(`GM ${formatDb(plot.gainMargin.gainMarginDb)} at ${formatEng(plot.gainMargin.freqHz, 'Hz')}`, gx, PHASE_H - 12, innerW, pal));
	}
	// Shared frequency axis labels.
	for (const f of ticks.major) {
		out.push(`<text x="${r(x(f))}" y="${PHASE_H + 16}" text-anchor="middle" fill="${pal.ink}">${esc(formatEng(f, 'Hz'))}</text>`);
	}
	out.push(`<text x="${r(innerW)}" y="${PHASE_H + 30}" text-anchor="end" font-size="10" fill="${pal.muted}">frequency (Hz)</text>`);
	out.push('</g>');
	out.push('</svg>');
	return out.join('\n');
}

function traces(plot: ExportPlot, x: ScaleLogarithmic<number, number>, y: ScaleLinear<number, number>, q: 'mag' | 'phase', pal: Palette): string {
	const parts: string[] = [];
	const sorted = [...plot.traces].sort((a, b) => rank(a) - rank(b));
	for (const t of sorted) {
		const d = path(x, y, plot.freqHz, q === 'mag' ? t.magDb : t.phaseDeg);
		if (!d) continue;
		const colour = t.kind === 'compensator' ? pal.comp : q === 'mag' ? pal.mag : pal.phase;
		const dash = DASH[t.kind] ? ` stroke-dasharray="${DASH[t.kind]}"` : '';
		const look = t.nominal ? 'stroke-width="2"' : 'stroke-width="1" stroke-opacity="0.35"';
		parts.push(`<path d="${d}" fill="none" stroke="${colour}" ${look}${dash}><title>${esc(t.label)}</title></path>`);
	}
	return parts.join('\n');
}

/** Corners under nominals; within each, network, plant, loop (loop on top). */
const rank = (t: ExportTrace) => (t.nominal ? 10 : 0) + ORDER.indexOf(t.kind);

function measuredDots(plot: ExportPlot, x: ScaleLogarithmic<number, number>, y: ScaleLinear<number, number>, q: 'mag' | 'phase', pal: Palette): string {
	const parts: string[] = [];
	for (const m of plot.measured ?? []) {
		const v = q === 'mag' ? m.magDb : m.phaseDeg;
		const dots: string[] = [];
		for (let i = 0; i < Math.min(m.freqHz.length, v.length); i++) {
			const f = m.freqHz[i];
			if (!(f > 0) || !Number.isFinite(v[i])) continue;
			const cx = x(f);
			const cy = y(v[i]);
			if (Number.isFinite(cx) && Number.isFinite(cy)) dots.push(`M${r(cx - 1.6)},${r(cy)}a1.6,1.6 0 1,0 3.2,0a1.6,1.6 0 1,0 -3.2,0`);
		}
		if (dots.length) parts.push(`<path d="${dots.join('')}" fill="${pal.measured}"><title>${esc(m.label)}</title></path>`);
	}
	return parts.join('\n');
}

function path(x: ScaleLogarithmic<number, number>, y: ScaleLinear<number, number>, freqHz: ArrayLike<number>, values: ArrayLike<number>): string {
	const count = Math.min(freqHz.length, values.length);
	const idx = Array.from({ length: count }, (_, i) => i);
	const gen = line<number>()
		.defined((i) => freqHz[i] > 0 && Number.isFinite(freqHz[i]) && Number.isFinite(values[i]))
		.x((i) => x(freqHz[i]))
		.y((i) => y(values[i]))
		.digits(2);
	return gen(idx) ?? '';
}

function grid(
	x: ScaleLogarithmic<number, number>,
	y: ScaleLinear<number, number>,
	ticks: { major: number[]; minor: number[] },
	yTicks: number[],
	height: number,
	width: number,
	pal: Palette,
	unit: string,
	reference: number
): string {
	const g: string[] = [`<rect width="${r(width)}" height="${height}" fill="none" stroke="${pal.grid}"/>`];
	for (const f of ticks.minor) g.push(`<line x1="${r(x(f))}" y1="0" x2="${r(x(f))}" y2="${height}" stroke="${pal.grid}" stroke-width="0.5"/>`);
	for (const f of ticks.major) g.push(`<line x1="${r(x(f))}" y1="0" x2="${r(x(f))}" y2="${height}" stroke="${pal.grid}"/>`);
	for (const v of yTicks) {
		const yy = r(y(v));
		const strong = v === reference;
		g.push(`<line x1="0" y1="${yy}" x2="${r(width)}" y2="${yy}" stroke="${strong ? pal.muted : pal.grid}" stroke-width="${strong ? 0.9 : 0.6}"/>`);
		g.push(`<text x="-6" y="${yy}" dy="0.32em" text-anchor="end" fill="${pal.ink}">${esc(`${v}${unit}`)}</text>`);
	}
	return g.join('\n');
}

function chip(text: string, cx: number, cy: number, width: number, pal: Palette): string {
	const w = text.length * 11 * 0.6 + 12;
	const left = Math.min(Math.max(0, cx + 6), Math.max(0, width - w));
	return [
		`<rect x="${r(left)}" y="${r(cy - 9)}" width="${r(w)}" height="18" rx="4" fill="${pal.panel}" stroke="${pal.ink}" stroke-width="0.75"/>`,
		`<text x="${r(left + 6)}" y="${r(cy)}" dy="0.35em" fill="${pal.ink}">${esc(text)}</text>`
	].join('\n');
}

/** One row of legend items in the top margin, right-aligned: dash sample, then the label. */
function legend(plot: ExportPlot, width: number, pal: Palette): string {
	const kinds = (['loop', 'plant', 'compensator'] as ExportTraceKind[]).filter((k) => plot.traces.some((t) => t.kind === k));
	const items: { label: string; draw: string }[] = kinds.map((k) => ({
		label: k === 'plant' ? plantTraceLabel(plot.control) : LABEL[k],
		draw: `<line x1="0" y1="0" x2="22" y2="0" stroke="${k === 'compensator' ? pal.comp : pal.mag}" stroke-width="2"${DASH[k] ? ` stroke-dasharray="${DASH[k]}"` : ''}/>`
	}));
	const corners = plot.traces.filter((t) => !t.nominal && t.kind === 'loop').length;
	if (corners > 0) items.push({ label: `${corners} corner${corners === 1 ? '' : 's'}`, draw: `<line x1="0" y1="0" x2="22" y2="0" stroke="${pal.mag}" stroke-width="1" stroke-opacity="0.35"/>` });
	for (const m of plot.measured ?? []) items.push({ label: m.label, draw: `<circle cx="11" cy="0" r="2.2" fill="${pal.measured}"/>` });
	const widths = items.map((it) => 28 + it.label.length * 10 * 0.6 + 14);
	let x = width - widths.reduce((a, b) => a + b, 0);
	return items
		.map((it, i) => {
			const g = `<g transform="translate(${r(x)},17)">${it.draw}<text x="28" y="0" dy="0.32em" font-size="10" fill="${pal.ink}">${esc(it.label)}</text></g>`;
			x += widths[i];
			return g;
		})
		.join('\n');
}

function finiteRange(plot: ExportPlot, pick: 'magDb' | 'phaseDeg'): [number, number] | null {
	let lo = Infinity;
	let hi = -Infinity;
	const scan = (v: ArrayLike<number>) => {
		for (let i = 0; i < v.length; i++) if (Number.isFinite(v[i])) [lo, hi] = [Math.min(lo, v[i]), Math.max(hi, v[i])];
	};
	plot.traces.forEach((t) => scan(t[pick]));
	plot.measured?.forEach((m) => scan(m[pick]));
	return lo <= hi ? [lo, hi] : null;
}

/** Outward to 20 dB steps, at least 40 dB tall, always showing 0 dB, within ±160 dB (as on screen). */
function magDomain(plot: ExportPlot): [number, number] {
	const range = finiteRange(plot, 'magDb');
	if (!range) return [-40, 60];
	const lo = Math.max(-160, Math.floor(Math.min(range[0], -20) / 20) * 20);
	let hi = Math.min(160, Math.ceil(Math.max(range[1], 20) / 20) * 20);
	if (hi - lo < 40) hi = lo + 40;
	return [lo, hi];
}

/** Outward to 45° steps, always showing −180° when the loop is drawn. */
function phaseDomain(plot: ExportPlot): [number, number] {
	const range = finiteRange(plot, 'phaseDeg');
	if (!range) return [-270, 0];
	let lo = Math.floor(range[0] / 45) * 45;
	let hi = Math.ceil(range[1] / 45) * 45;
	if (plot.traces.some((t) => t.kind === 'loop')) lo = Math.min(lo, -180);
	lo = Math.max(lo, -720);
	hi = Math.min(hi, 360);
	if (hi - lo < 90) hi = lo + 90;
	return [lo, hi];
}

function stepTicks([lo, hi]: [number, number], steps: number[], maxTicks: number): number[] {
	const step = steps.find((s) => (hi - lo) / s <= maxTicks) ?? steps[steps.length - 1];
	const out: number[] = [];
	for (let v = Math.ceil(lo / step) * step; v <= hi + 1e-9; v += step) out.push(Math.abs(v) < 1e-9 ? 0 : v);
	return out;
}

function logTicks(startHz: number, stopHz: number): { major: number[]; minor: number[] } {
	const major: number[] = [];
	const minor: number[] = [];
	for (let e = Math.floor(Math.log10(startHz)); e <= Math.ceil(Math.log10(stopHz)); e++) {
		const decade = 10 ** e;
		if (decade >= startHz * (1 - 1e-9) && decade <= stopHz * (1 + 1e-9)) major.push(decade);
		for (let k = 2; k <= 9; k++) if (k * decade > startHz && k * decade < stopHz) minor.push(k * decade);
	}
	return { major, minor };
}

const inRange = (f: number, lo: number, hi: number) => Number.isFinite(f) && f >= lo && f <= hi;
const r = (v: number) => (Number.isFinite(v) ? Math.round(v * 100) / 100 : 0);
/** Text content for XML: characters XML 1.0 forbids become U+FFFD first (drawableText), then the markup characters are escaped. */
const esc = (s: string) => drawableText(s).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
