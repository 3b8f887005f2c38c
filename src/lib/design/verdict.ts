/**
 * The verdict: the margins at every corner against the targets, with the corner that sets the
 * worst case and the reason in words. Thresholds [common practice]: a phase margin up to 5°
 * short, a gain margin up to 3 dB short, or a crossover above fsw/5 is a caution; more, an
 * unstable closed loop, or a crossover above fsw/2 (outside the averaged model) is a fail.
 */
import { formatDb, formatDeg, formatEng } from '$lib/units';
import type { DesignAnalysis } from './analysis';

export type Status = 'pass' | 'caution' | 'fail';

export interface VerdictRow {
	metric: 'pm' | 'gm' | 'fc' | 'stability';
	label: string;
	status: Status;
	/** The worst value found, formatted. */
	value: string;
	target: string;
	/** The corner that sets it. */
	corner: string | null;
	reason: string;
}

export interface Verdict {
	status: Status;
	rows: VerdictRow[];
	/** One sentence for the heading. */
	summary: string;
}

const rank: Record<Status, number> = { pass: 0, caution: 1, fail: 2 };
const worse = (a: Status, b: Status) => (rank[b] > rank[a] ? b : a);

function where(label: string, vin: number, iout: number) {
	return `${label} (Vin = ${formatEng(vin, 'V')}, Iout = ${formatEng(iout, 'A')})`;
}

export function verdictOf(a: DesignAnalysis): Verdict {
	const t = a.targets;
	const fsw = a.document.plant.fsw;
	const rows: VerdictRow[] = [];
	const usable = a.corners.filter((c) => c.detail);
	const failed = a.corners.filter((c) => !c.detail);

	// Phase margin: the smallest across corners; no crossover anywhere is a fail.
	const noCrossing = usable.find((c) => c.detail!.response.metrics.phaseMarginDeg === null);
	let pmWorst: { pm: number | null; c: (typeof usable)[number] } | null = noCrossing ? { pm: null, c: noCrossing } : null;
	if (!noCrossing) {
		for (const c of usable) {
			const pm = c.detail!.response.metrics.phaseMarginDeg!;
			if (pmWorst === null || pm < pmWorst.pm!) pmWorst = { pm, c };
		}
	}
	if (pmWorst) {
		const { pm, c } = pmWorst;
		const at = where(c.corner.label, c.corner.vin, c.corner.iout);
		const status: Status = pm === null ? 'fail' : pm >= t.phaseMarginDeg ? 'pass' : pm >= t.phaseMarginDeg - 5 ? 'caution' : 'fail';
		rows.push({
			metric: 'pm',
			label: 'Phase margin',
			status,
			value: pm === null ? 'no crossover' : formatDeg(pm),
			target: `≥ ${formatDeg(t.phaseMarginDeg)}`,
			corner: c.corner.label,
			reason:
				pm === null
					? `The loop gain never reaches 0 dB at ${at}.`
					: `PM ${formatDeg(pm)} at ${at} — ${status === 'pass' ? 'meets' : 'below'} the ${formatDeg(t.phaseMarginDeg)} target.`
		});
	}

	// Gain margin: the smallest positive one; none anywhere means the phase never reaches −180°.
	let gmWorst: { gm: number; c: (typeof usable)[number] } | null = null;
	for (const c of usable) {
		const gm = c.detail!.response.metrics.gainMarginDb;
		if (gm !== null && (gmWorst === null || gm < gmWorst.gm)) gmWorst = { gm, c };
	}
	if (gmWorst) {
		const { gm, c } = gmWorst;
		const status: Status = gm >= t.gainMarginDb ? 'pass' : gm >= t.gainMarginDb - 3 ? 'caution' : 'fail';
		rows.push({
			metric: 'gm',
			label: 'Gain margin',
			status,
			value: formatDb(gm),
			target: `≥ ${formatDb(t.gainMarginDb)}`,
			corner: c.corner.label,
			reason: `GM ${formatDb(gm)} at ${where(c.corner.label, c.corner.vin, c.corner.iout)} — ${status === 'pass' ? 'meets' : 'below'} the ${formatDb(t.gainMarginDb)} target.`
		});
	} else if (usable.length) {
		rows.push({ metric: 'gm', label: 'Gain margin', status: 'pass', value: 'no −180° crossing', target: `≥ ${formatDb(t.gainMarginDb)}`, corner: null, reason: 'The loop phase never reaches −180° in the analysed range.' });
	}

	// Crossover: the highest across corners against fsw/5 and fsw/2; the nominal against the target.
	let fcHigh: { fc: number; c: (typeof usable)[number] } | null = null;
	for (const c of usable) {
		const fc = c.detail!.response.metrics.crossoverHz;
		if (fc !== null && (fcHigh === null || fc > fcHigh.fc)) fcHigh = { fc, c };
	}
	const fcNom = a.nominal.response.metrics.crossoverHz;
	if (fcHigh) {
		const { fc, c } = fcHigh;
		const status: Status = fc > fsw / 2 ? 'fail' : fc > fsw / 5 ? 'caution' : 'pass';
		const off = fcNom !== null ? fcNom / t.crossoverHz - 1 : null;
		const nominalWords = fcNom !== null ? `nominal ${formatEng(fcNom, 'Hz')}${off !== null && Math.abs(off) > 0.1 ? ` (${off > 0 ? '+' : ''}${Math.round(off * 100)}% from the target)` : ''}` : 'no nominal crossover';
		rows.push({
			metric: 'fc',
			label: 'Crossover',
			status,
			value: formatEng(fc, 'Hz'),
			target: `${formatEng(t.crossoverHz, 'Hz')}, ≤ fsw/5 = ${formatEng(fsw / 5, 'Hz')}`,
			corner: c.corner.label,
			reason:
				status === 'pass'
					? `Highest fc ${formatEng(fc, 'Hz')} at ${c.corner.label}; ${nominalWords}.`
					: `fc ${formatEng(fc, 'Hz')} at ${where(c.corner.label, c.corner.vin, c.corner.iout)} is above fsw/${status === 'fail' ? 2 : 5}; ${nominalWords}.`
		});
	}

	// Closed-loop stability from the poles, not from the margins.
	const unstable = usable.find((c) => c.detail!.response.metrics.closedLoopStable === false);
	const unknown = usable.filter((c) => c.detail!.response.metrics.closedLoopStable === null);
	rows.push({
		metric: 'stability',
		label: 'Closed loop',
		status: unstable || failed.length ? 'fail' : unknown.length ? 'caution' : 'pass',
		value: unstable ? 'unstable' : failed.length ? `${failed.length} corner(s) not analysed` : unknown.length ? 'not decided' : 'stable',
		target: 'stable at every corner',
		corner: unstable?.corner.label ?? failed[0]?.corner.label ?? null,
		reason: unstable
			? `A closed-loop pole is in the right half plane at ${where(unstable.corner.label, unstable.corner.vin, unstable.corner.iout)}.`
			: failed.length
				? `${failed[0].corner.label}: ${failed[0].error}`
				: unknown.length
					? `The closed-loop poles could not be found at ${unknown[0].corner.label}.`
					: `All ${usable.length} corners have their closed-loop poles in the left half plane.`
	});

	const status = rows.reduce<Status>((s, r) => worse(s, r.status), 'pass');
	const first = rows.find((r) => r.status === status && status !== 'pass');
	const summary = status === 'pass' ? `Meets every target at all ${usable.length} corners.` : first!.reason;
	return { status, rows, summary };
}
