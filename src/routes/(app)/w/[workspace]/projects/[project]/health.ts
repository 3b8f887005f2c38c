// Board health: one rail's worst case across the corners of its latest saved loop, judged
// against the rail's margin targets. Thresholds as on the design screen [common practice]: a
// phase margin up to 5° short or a gain margin up to 3 dB short is a caution, more is a fail;
// a crossover above the target fraction of fsw is a caution, above fsw/2 (beyond the averaged
// model) a fail; an unstable closed loop or a corner the engine refused is a fail.
import type { CornerMetrics, LoopSummary, MarginTargets } from '$lib/client/types';
import { formatDb, formatDeg, formatEng } from '$lib/units';
import { worse, type ChipStatus } from '$lib/components/table/status';

export interface Judged {
	value: number | null;
	/** The corner that sets it ("Vin max, Iout min"), null when no corner has the value. */
	corner: string | null;
	status: ChipStatus;
	reason: string;
}

export interface RailHealth {
	fc: Judged;
	pm: Judged;
	gm: Judged;
	overall: ChipStatus;
	/** The reason of the worst metric, or a one-line all-clear. */
	summary: string;
}

const none = (reason: string): Judged => ({ value: null, corner: null, status: 'none', reason });

function judgePm(metrics: CornerMetrics[], t: MarginTargets): Judged {
	const target = `the ${formatDeg(t.phaseMarginDeg)} target`;
	const noCrossing = metrics.find((m) => !m.error && m.phaseMarginDeg === null);
	if (noCrossing) return { value: null, corner: noCrossing.corner.label, status: 'fail', reason: `no crossover at ${noCrossing.corner.label}` };
	let worst: CornerMetrics | null = null;
	for (const m of metrics) if (m.phaseMarginDeg !== null && (worst === null || m.phaseMarginDeg < worst.phaseMarginDeg!)) worst = m;
	if (!worst) return none('no corner analysed');
	const pm = worst.phaseMarginDeg!;
	const status: ChipStatus = pm >= t.phaseMarginDeg ? 'pass' : pm >= t.phaseMarginDeg - 5 ? 'caution' : 'fail';
	return { value: pm, corner: worst.corner.label, status, reason: `PM ${formatDeg(pm)} at ${worst.corner.label}, ${status === 'pass' ? 'meets' : 'below'} ${target}` };
}

function judgeGm(metrics: CornerMetrics[], t: MarginTargets): Judged {
	let worst: CornerMetrics | null = null;
	for (const m of metrics) if (m.gainMarginDb !== null && (worst === null || m.gainMarginDb < worst.gainMarginDb!)) worst = m;
	if (!worst) {
		return metrics.some((m) => !m.error)
			? { value: null, corner: null, status: 'pass', reason: 'the loop phase never reaches −180°' }
			: none('no corner analysed');
	}
	const gm = worst.gainMarginDb!;
	const status: ChipStatus = gm >= t.gainMarginDb ? 'pass' : gm >= t.gainMarginDb - 3 ? 'caution' : 'fail';
	return { value: gm, corner: worst.corner.label, status, reason: `GM ${formatDb(gm)} at ${worst.corner.label}, ${status === 'pass' ? 'meets' : 'below'} the ${formatDb(t.gainMarginDb)} target` };
}

function judgeFc(metrics: CornerMetrics[], t: MarginTargets, fsw: number): Judged {
	let highest: CornerMetrics | null = null;
	for (const m of metrics) if (m.crossoverHz !== null && (highest === null || m.crossoverHz > highest.crossoverHz!)) highest = m;
	if (!highest) return none('no crossover');
	const fc = highest.crossoverHz!;
	const limit = t.maxCrossoverFraction * fsw;
	const status: ChipStatus = fc > fsw / 2 ? 'fail' : fc > limit ? 'caution' : 'pass';
	const words =
		status === 'fail'
			? `above fsw/2 = ${formatEng(fsw / 2, 'Hz')}, beyond the averaged model`
			: status === 'caution'
				? `above the ${formatEng(limit, 'Hz')} limit (${t.maxCrossoverFraction} × fsw)`
				: `within ${formatEng(limit, 'Hz')}`;
	return { value: fc, corner: highest.corner.label, status, reason: `fc ${formatEng(fc, 'Hz')} at ${highest.corner.label}, ${words}` };
}

export function railHealth(loop: LoopSummary | null, targets: MarginTargets, fsw: number): RailHealth {
	if (!loop) {
		const n = none('no saved loop yet');
		return { fc: n, pm: n, gm: n, overall: 'none', summary: 'No saved loop yet: open the rail to design one.' };
	}
	const metrics = loop.metrics ?? [];
	const fc = judgeFc(metrics, targets, fsw);
	const pm = judgePm(metrics, targets);
	const gm = judgeGm(metrics, targets);
	const refused = metrics.find((m) => m.error);
	const unstable = metrics.find((m) => m.closedLoopStable === false);
	let overall = [fc, pm, gm].reduce<ChipStatus>((s, j) => worse(s, j.status), 'pass');
	let summary = '';
	if (unstable) {
		overall = 'fail';
		summary = `closed loop unstable at ${unstable.corner.label}`;
	} else if (refused) {
		overall = 'fail';
		summary = `${refused.corner.label} not analysed: ${refused.error}`;
	} else if (metrics.length === 0) {
		overall = 'none';
		summary = 'the revision has no corner results';
	} else if (overall === 'pass') {
		summary = `meets every target at all ${metrics.length} corners`;
	} else {
		summary = [pm, gm, fc].find((j) => j.status === overall)!.reason;
	}
	return { fc, pm, gm, overall, summary };
}
