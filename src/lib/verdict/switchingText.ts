// The words and numbers of a switching check (engine/switching), shared by the design screen's
// tab, the review page and the sign-off PDF: the verdict line (agreement or the engine's caution
// with its usual causes), the table of PM and fc beside the averaged ones, the orbit, the
// injection's linearity, and how a check kept with a revision is dated and versioned.
import type { SwitchingCheckResult } from '../engine/switching/check';
import { formatDb, formatDeg, formatEng } from '../units';

/** A switching check kept with a revision (loop_revision.switching_check). */
export interface StoredSwitchingCheck {
	/** ENGINE_VERSION that ran it; another version's figures are shown as such, not re-run by themselves. */
	engineVersion: string;
	/** When it ran (ISO time). */
	computedAt: string;
	/** Who asked for it (user id), or null. */
	requestedBy: string | null;
	/** The frequencies asked for, Hz; null: the check's defaults. */
	freqHz: number[] | null;
	result: SwitchingCheckResult;
}

export const SWITCHING_HEADER = ['', 'Switching model', 'Averaged model', 'Difference'] as const;

const hz = (v: number | null) => (v === null ? '—' : formatEng(v, 'Hz'));
const signedDeg = (v: number) => `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(1)}°`;

/** One sentence: not run (why), agrees (within what), or the engine's caution (which names the usual causes). */
export function switchingVerdictText(r: SwitchingCheckResult): { tone: 'pass' | 'caution'; text: string } {
	if (r.status === 'not-run') return { tone: 'caution', text: `Not run: ${r.reason ?? 'outside the switching model'}` };
	if (r.caution) return { tone: 'caution', text: r.caution };
	return {
		tone: 'pass',
		text: `Agrees with the averaged model: within ${r.tolerance.phaseMarginDeg}° in PM and ${Math.round(r.tolerance.crossoverFraction * 100)} % in fc.`
	};
}

/** Rows of PM and fc: label, switching, averaged, difference. */
export function switchingFigureRows(r: SwitchingCheckResult): string[][] {
	const sw = r.switching;
	const av = r.averaged;
	return [
		[
			'Phase margin',
			formatDeg(sw.phaseMarginDeg),
			formatDeg(av.phaseMarginDeg),
			sw.phaseMarginDeg !== null && av.phaseMarginDeg !== null ? signedDeg(sw.phaseMarginDeg - av.phaseMarginDeg) : '—'
		],
		[
			'Crossover fc',
			hz(sw.crossoverHz),
			hz(av.crossoverHz),
			sw.crossoverHz !== null && av.crossoverHz !== null ? `${((sw.crossoverHz / av.crossoverHz - 1) * 100).toFixed(1)} %` : '—'
		]
	];
}

/** The orbit in words with its duty and inductor-current span, or null when none was found. */
export function switchingOrbitText(r: SwitchingCheckResult): string | null {
	if (!r.orbit) return null;
	const o = r.orbit;
	return `${o.words} Duty ${(o.duty * 100).toFixed(2)} %, inductor current ${formatEng(o.valleyCurrent, 'A')} … ${formatEng(o.peakCurrent, 'A')}.`;
}

const small = (v: number, unit: string) => (Math.abs(v) < 0.001 ? `less than 0.001 ${unit}` : `${Math.abs(v).toFixed(3)} ${unit}`);

export function switchingLinearityText(r: SwitchingCheckResult): string | null {
	if (!r.linearity) return null;
	const l = r.linearity;
	return `Injection: about 0.1 % of duty; at ${formatEng(l.freqHz, 'Hz')} half of it moved |T| by ${small(l.deltaDb, 'dB')} and ∠T by ${small(l.deltaDeg, '°')}.`;
}

/** Rows of the measured points: f, |T| switching, |T| averaged, ∠T switching, ∠T averaged. */
export const SWITCHING_POINTS_HEADER = ['f', '|T| switching', '|T| averaged', '∠T switching', '∠T averaged'] as const;
export function switchingPointRows(r: SwitchingCheckResult): string[][] {
	return r.points.map((p) => [formatEng(p.freqHz, 'Hz'), formatDb(p.magDb), formatDb(p.averagedMagDb), formatDeg(p.phaseUnwrappedDeg), formatDeg(p.averagedPhaseDeg)]);
}

/** Where a kept check came from, and whether the engine has changed since. */
export function storedCheckText(s: StoredSwitchingCheck, currentEngine: string, when: string): string {
	const base = `Run on the server ${when} with engine version ${s.engineVersion} and kept with this revision.`;
	return s.engineVersion === currentEngine ? base : `${base} The engine is now version ${currentEngine}: run it again for current figures.`;
}
