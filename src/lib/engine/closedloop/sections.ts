/**
 * The optional robustness sections of the analysis response, built from an analysed design:
 * `closedLoop` (closed-loop responses, poles, load and reference steps), `corners` (when the
 * document has a `corners` section), `inputFilter` (when it has `inputFilter`) and `spread`
 * (Monte Carlo, when asked for with at most INLINE_SPREAD_MAX samples; larger runs belong to
 * saved-loop reports). Every number handed out is finite: dB arrays are clamped to ±1000 dB.
 */
import type { AnalysisDetail } from '../analyze';
import type { EngineWarning } from '../errors';
import { modulatorTf } from '../plants/modulator';
import { defaultSweepRange, logGrid } from '../sweep/grid';
import { runCorners, type CornerReport } from '../corners/corners';
import { loopSpecFromDetail } from '../corners/loopModel';
import type { PartName } from '../corners/variation';
import { analyzeInputFilter, type InputFilterReport } from '../inputfilter/analyzeInputFilter';
import { runSpread, type PartTolerance, type SpreadResult } from '../spread/spread';
import { analyzeClosedLoop, type ClosedLoopInput, type ClosedLoopSection, type LoadStepSettings } from './analyzeClosedLoop';
import type { Bode } from './responses';
import { roundDecimals } from '../math/displayRounding';
import { spreadTargetsOf, targetsOf } from '../contract/targetsSchema';
import { cornerChecksFor } from '../verify/checks';
import { modulatorInputOf } from '../pipeline/documentModel';

/** The closed-loop model's input for an analysed design: its built network, modulator and stage. */
export function closedLoopInputOf(detail: AnalysisDetail, freqHz: ArrayLike<number>, loadStep?: LoadStepSettings): ClosedLoopInput {
	const d = detail.document;
	return {
		plant: detail.plant,
		compensator: detail.compensator.built,
		modulator: modulatorTf(modulatorInputOf(d), d.plant.vin),
		dividerRatio: d.feedback.vref / d.plant.vout,
		vout: d.plant.vout,
		capacitors: d.plant.capacitors,
		freqHz,
		crossoverHz: detail.metrics.crossoverHz,
		phaseMarginDeg: detail.metrics.phaseMarginDeg,
		loadStep
	};
}

/** Largest Monte Carlo run done inline with an analysis. */
export const INLINE_SPREAD_MAX = 2000;

export type ClosedLoopReport = Omit<ClosedLoopSection, 'warnings'>;
export type SpreadReport = Omit<SpreadResult, 'crossoverHz' | 'phaseMarginDeg' | 'gainMarginDb' | 'stable'>;

export interface RobustnessSections {
	closedLoop?: ClosedLoopReport;
	corners?: CornerReport;
	inputFilter?: InputFilterReport;
	spread?: SpreadReport;
	warnings: EngineWarning[];
}

export interface RobustnessOptions {
	/** Compute the closed-loop section. */
	closedLoop: boolean;
	/** Compute the corners, input-filter and spread sections the document asks for [true]. */
	sections?: boolean;
}

const clampDb = (x: number) => (Number.isNaN(x) ? -1000 : Math.max(-1000, Math.min(1000, x)));
const finiteOr0 = (x: number) => (Number.isFinite(x) ? x : 0);
// Display traces: finite, and to 1e-4 dB and 1e-4° (displayRounding.ts says why).
const cleanDb = (a: readonly number[]) => a.map((x) => roundDecimals(clampDb(x), 4));
const cleanDeg = (a: readonly number[]) => a.map((x) => roundDecimals(finiteOr0(x), 4));
const cleanBode = (b: Bode): Bode => ({ magDb: cleanDb(b.magDb), phaseDeg: cleanDeg(b.phaseDeg) });

/** The grid the sections use: the response's sweep, or the document's sweep, or the default one. */
function sectionGrid(detail: AnalysisDetail): number[] {
	const shown = detail.response.response.freqHz;
	if (shown.length) return shown;
	const s = detail.document.sweep;
	if (s && 'freqHz' in s) return [...s.freqHz];
	const r = s ?? { ...defaultSweepRange(detail.plant.features.f0Hz, detail.document.plant.fsw), points: 400 };
	return Array.from(logGrid(r.startHz, r.stopHz, r.points));
}

/** Engine failures inside one section become a warning; the rest of the analysis stands. */
function guarded<T>(what: string, warnings: EngineWarning[], fn: () => T): T | undefined {
	try {
		return fn();
	} catch (e) {
		if (!(e instanceof Error)) throw e;
		warnings.push({ code: `${what}-unavailable`, message: `The ${what} section could not be computed: ${(e as Error).message}` });
		return undefined;
	}
}

export function robustnessSections(detail: AnalysisDetail, options: RobustnessOptions): RobustnessSections {
	const d = detail.document;
	const warnings: EngineWarning[] = [];
	const out: RobustnessSections = { warnings };
	const wantSections = options.sections ?? true;
	const wantCorners = wantSections && d.corners !== undefined;
	const wantFilter = wantSections && d.inputFilter !== undefined;
	const wantSpread = wantSections && d.spread !== undefined;
	if (!options.closedLoop && !wantCorners && !wantFilter && !wantSpread) return out;
	const grid = sectionGrid(detail);

	if (options.closedLoop) {
		const section = guarded('closed-loop', warnings, () =>
			analyzeClosedLoop(closedLoopInputOf(detail, grid, d.loadStep))
		);
		if (section) {
			const { warnings: w, responses: r, ...rest } = section;
			warnings.push(...w);
			out.closedLoop = {
				...rest,
				polesHz: rest.polesHz.filter((p) => Number.isFinite(p.re) && Number.isFinite(p.im)),
				responses: {
					freqHz: r.freqHz,
					outputImpedanceOpen: cleanBode(r.outputImpedanceOpen),
					outputImpedanceClosed: cleanBode(r.outputImpedanceClosed),
					lineToOutputOpen: cleanBode(r.lineToOutputOpen),
					lineToOutputClosed: cleanBode(r.lineToOutputClosed),
					referenceToOutput: cleanBode(r.referenceToOutput),
					sensitivity: cleanBode(r.sensitivity),
					complementarySensitivity: cleanBode(r.complementarySensitivity),
					sensitivityPeakDb: clampDb(r.sensitivityPeakDb),
					sensitivityPeakHz: finiteOr0(r.sensitivityPeakHz)
				}
			};
		}
	}

	const tolerances = d.tolerances ?? {};
	const spec = wantCorners || wantSpread ? guarded('corners', warnings, () => loopSpecFromDetail(detail)) : undefined;

	if (wantCorners && spec && d.corners) {
		const tol: Partial<Record<PartName, number>> = {};
		for (const [name, t] of Object.entries(tolerances)) if (t) tol[name as PartName] = t.tol;
		const cs = d.corners;
		const report = guarded('corners', warnings, () =>
			runCorners(spec, { vin: cs.vin, iout: cs.iout, temperature: cs.temperature, tolerances: tol, maxCorners: cs.maxCorners, checks: cornerChecksFor(d) }, grid)
		);
		if (report) {
			out.corners = { ...report, traces: report.traces.map((t) => ({ ...t, magDb: cleanDb(t.magDb), phaseDeg: cleanDeg(t.phaseDeg) })) };
			if (report.unstableCorners > 0) {
				warnings.push({ code: 'corner-unstable', message: `${report.unstableCorners} of ${report.corners.length} corners give an unstable closed loop.` });
			}
			if (report.failedCorners > 0) {
				warnings.push({ code: 'corner-not-modelled', message: `${report.failedCorners} of ${report.corners.length} corners cannot be modelled (see corners[].error).` });
			}
		}
	}

	if (wantFilter && d.inputFilter) {
		const f = d.inputFilter;
		const report = guarded('input-filter', warnings, () =>
			analyzeInputFilter(
				{ l: f.l, dcr: f.dcr, c: f.c, damping: f.damping, marginDb: f.marginDb },
				detail.plant,
				detail.loop,
				grid,
				detail.response.metrics.analysedRangeHz
			)
		);
		if (report) {
			out.inputFilter = {
				...report,
				impedances: { freqHz: report.impedances.freqHz, zsDb: cleanDb(report.impedances.zsDb), znDb: cleanDb(report.impedances.znDb), zdDb: cleanDb(report.impedances.zdDb) },
				middlebrook: {
					...report.middlebrook,
					marginNDb: clampDb(report.middlebrook.marginNDb),
					marginDDb: clampDb(report.middlebrook.marginDDb)
				},
				loopWithFilter: cleanBode(report.loopWithFilter)
			};
		}
	}

	if (wantSpread && spec && d.spread) {
		const s = d.spread;
		const tols: Partial<Record<PartName, PartTolerance>> = {};
		for (const [name, t] of Object.entries(tolerances)) if (t && t.tol > 0) tols[name as PartName] = { tol: t.tol, dist: t.dist, sigmas: t.sigmas };
		if (s.samples > INLINE_SPREAD_MAX) {
			warnings.push({
				code: 'spread-not-inline',
				message: `spread.samples = ${s.samples} is more than the ${INLINE_SPREAD_MAX} run with an analysis; the saved loop's report runs the full spread.`
			});
		} else if (Object.keys(tols).length === 0) {
			warnings.push({ code: 'spread-without-tolerances', message: 'A spread was asked for, but the tolerances section gives no part a tolerance > 0.' });
		} else {
			const r = guarded('spread', warnings, () => runSpread(spec, { samples: s.samples, seed: s.seed, tolerances: tols, targets: s.targets ?? spreadTargetsOf(targetsOf(d), d.plant.fsw), bins: s.bins }));
			if (r) {
				const { crossoverHz: _fc, phaseMarginDeg: _pm, gainMarginDb: _gm, stable: _st, ...summary } = r;
				out.spread = summary;
			}
		}
	}
	return out;
}
