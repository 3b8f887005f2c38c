/**
 * The design screen's robustness panels: their inputs (typed text, read with the units parser
 * into SI values or field errors) and the engine runs behind them — closed-loop responses and
 * steps of the nominal design, corners (Vin × Iout × part tolerances), the Monte Carlo
 * configuration for the worker, and the input-filter check. All engine work is the shared
 * engine's (closedloop/, corners/, spread/, inputfilter/); this module only wires it.
 */
import type { AnalysisDetail } from '$lib/engine';
import { robustnessSections, type ClosedLoopReport } from '$lib/engine/closedloop/sections';
import { runCorners, type CornerReport } from '$lib/engine/corners/corners';
import { loopSpecFromDetail, type LoopSpec } from '$lib/engine/corners/loopModel';
import { partsPresent, type PartName } from '$lib/engine/corners/variation';
import { analyzeInputFilter, type InputFilterReport } from '$lib/engine/inputfilter/analyzeInputFilter';
import { MAX_SAMPLES, type PartTolerance, type SpreadConfig } from '$lib/engine/spread/spread';
import { parseQuantity } from '$lib/units';
import type { FieldSpec, FormTargets, OperatingRange } from './form';

type Read<T> = { value: T | null; errors: Record<string, string> };

function reader() {
	const errors: Record<string, string> = {};
	const num = (key: string, text: string, spec: FieldSpec): number => {
		const r = parseQuantity(text, spec);
		if (r.ok) return r.value;
		errors[key] = r.error;
		return Number.NaN;
	};
	return { errors, num };
}

// ---------------------------------------------------------------- step settings

export interface StepForm {
	step: string;
	riseTime: string;
	referenceStep: string;
}
export const STEP_FIELDS: Record<keyof StepForm, FieldSpec> = {
	step: { label: 'Load step ΔI', unit: 'A', hint: 'positive = more load' },
	riseTime: { label: 'Edge rise time', unit: 's', positive: true, allowZero: true, max: 1 },
	referenceStep: { label: 'Reference step', unit: 'V' }
};
export const defaultStepForm = (iout: number, vref: number): StepForm => ({
	step: fmt(0.5 * iout),
	riseTime: '1u',
	referenceStep: fmt(0.01 * vref)
});

const fmt = (x: number) => Number(x.toPrecision(3)).toString();

export function readStep(f: StepForm): Read<{ step: number; riseTime: number; referenceStep: number }> {
	const { errors, num } = reader();
	const step = num('step', f.step, STEP_FIELDS.step);
	const riseTime = num('riseTime', f.riseTime, STEP_FIELDS.riseTime);
	const referenceStep = num('referenceStep', f.referenceStep, STEP_FIELDS.referenceStep);
	if (!errors.step && step === 0) errors.step = 'must be ≠ 0';
	if (!errors.referenceStep && referenceStep === 0) errors.referenceStep = 'must be ≠ 0';
	return Object.keys(errors).length ? { value: null, errors } : { value: { step, riseTime, referenceStep }, errors };
}

/** Closed-loop responses, poles and the two step responses of the nominal design. */
export function closedLoopOf(nominal: AnalysisDetail, loadStep: { step: number; riseTime: number; referenceStep: number }): { report: ClosedLoopReport | null; warnings: string[] } {
	const detail = { ...nominal, document: { ...nominal.document, loadStep: { ...loadStep, settleFraction: 0.02 } } };
	const s = robustnessSections(detail, { closedLoop: true, sections: false });
	return { report: s.closedLoop ?? null, warnings: s.warnings.map((w) => w.message) };
}

// ---------------------------------------------------------------- tolerances

export interface ToleranceRow {
	part: PartName;
	label: string;
	/** Percent text, e.g. "20" for ±20 %. */
	tol: string;
	dist: 'uniform' | 'normal';
}

const PART_LABEL: Record<PartName, string> = {
	l: 'L',
	dcr: 'DCR',
	rdsOn: 'RDS(on)',
	c: 'C (each branch)',
	esr: 'ESR',
	esl: 'ESL',
	r1: 'R1',
	r2: 'R2',
	r3: 'R3',
	c1: 'C1',
	c2: 'C2',
	c3: 'C3',
	gm: 'gm',
	ro: 'Ro',
	vramp: 'Ramp Vpp'
};
/** Usual tolerances [common practice: power inductors ±20 %, ceramics ±10–20 %, ESR wide, 1 % resistors, 5 % C0G]. */
const DEFAULT_TOL: Record<PartName, number> = { l: 20, dcr: 10, rdsOn: 30, c: 20, esr: 50, esl: 30, r1: 1, r2: 1, r3: 1, c1: 5, c2: 5, c3: 5, gm: 20, ro: 20, vramp: 5 };

export const TOL_SPEC: FieldSpec = { label: 'Tolerance', unit: '', suffix: '%', min: 0, max: 90 };

/** One row per part the loop has, with the usual tolerance; rows the user already set are kept. */
export function toleranceRows(spec: LoopSpec, previous: ToleranceRow[] = []): ToleranceRow[] {
	return partsPresent(spec).map((part) => previous.find((r) => r.part === part) ?? { part, label: PART_LABEL[part], tol: String(DEFAULT_TOL[part]), dist: part === 'l' || part === 'c' ? 'normal' : 'uniform' });
}

export function readTolerances(rows: ToleranceRow[]): Read<Partial<Record<PartName, PartTolerance>>> {
	const { errors, num } = reader();
	const out: Partial<Record<PartName, PartTolerance>> = {};
	for (const r of rows) {
		const pct = num(`tol.${r.part}`, r.tol, TOL_SPEC);
		if (pct > 0) out[r.part] = { tol: pct / 100, dist: r.dist, sigmas: 3 };
	}
	return Object.keys(errors).length ? { value: null, errors } : { value: out, errors };
}

export function specOf(nominal: AnalysisDetail): LoopSpec {
	return loopSpecFromDetail(nominal);
}

// ---------------------------------------------------------------- corners

/** Above this many corners the screen runs each part alone plus the linearised worst cases. */
export const SCREEN_MAX_CORNERS = 512;

export function cornersOf(nominal: AnalysisDetail, range: OperatingRange, tolerances: Partial<Record<PartName, PartTolerance>>, freqHz: ArrayLike<number>): CornerReport {
	const tol: Partial<Record<PartName, number>> = {};
	for (const [k, t] of Object.entries(tolerances)) if (t) tol[k as PartName] = t.tol;
	return runCorners(
		specOf(nominal),
		{ vin: { min: range.vin[0], max: range.vin[2] }, iout: { min: range.iout[0], max: range.iout[2] }, tolerances: tol, maxCorners: SCREEN_MAX_CORNERS },
		freqHz
	);
}

// ---------------------------------------------------------------- Monte Carlo

export interface SpreadForm {
	samples: string;
	seed: string;
}
export const SPREAD_FIELDS: Record<keyof SpreadForm, FieldSpec> = {
	samples: { label: 'Samples N', unit: '', integer: true, min: 1, max: MAX_SAMPLES },
	seed: { label: 'Seed', unit: '', integer: true, min: 0, max: 2 ** 32 - 1 }
};

export function readSpread(f: SpreadForm, rows: ToleranceRow[], targets: FormTargets): Read<SpreadConfig> {
	const { errors, num } = reader();
	const samples = num('samples', f.samples, SPREAD_FIELDS.samples);
	const seed = num('seed', f.seed, SPREAD_FIELDS.seed);
	const t = readTolerances(rows);
	Object.assign(errors, t.errors);
	if (Object.keys(errors).length || !t.value) return { value: null, errors };
	if (Object.keys(t.value).length === 0) return { value: null, errors: { ...errors, tolerances: 'give at least one part a tolerance > 0 %' } };
	return {
		value: { samples, seed, tolerances: t.value, targets: { phaseMarginDeg: targets.phaseMarginDeg, gainMarginDb: targets.gainMarginDb }, bins: 40 },
		errors
	};
}

// ---------------------------------------------------------------- input filter

export interface FilterForm {
	l: string;
	dcr: string;
	c: string;
	rd: string;
	cd: string;
	marginDb: string;
}
export const FILTER_FIELDS: Record<keyof FilterForm, FieldSpec> = {
	l: { label: 'Lf', unit: 'H', positive: true },
	dcr: { label: 'Lf series R', unit: 'Ω', positive: true, allowZero: true },
	c: { label: 'Cf', unit: 'F', positive: true },
	rd: { label: 'Rd (damping)', unit: 'Ω', positive: true, hint: 'empty = no damping' },
	cd: { label: 'Cd (damping)', unit: 'F', positive: true },
	marginDb: { label: 'Required margin', unit: '', suffix: 'dB', min: 0, max: 40 }
};
export const defaultFilterForm = (): FilterForm => ({ l: '1u', dcr: '5m', c: '10u', rd: '', cd: '40u', marginDb: '6' });

export function readFilter(f: FilterForm): Read<{ l: number; dcr: number; c: number; damping: { rd: number; cd: number } | null; marginDb: number }> {
	const { errors, num } = reader();
	const l = num('l', f.l, FILTER_FIELDS.l);
	const dcr = num('dcr', f.dcr, FILTER_FIELDS.dcr);
	const c = num('c', f.c, FILTER_FIELDS.c);
	const marginDb = num('marginDb', f.marginDb, FILTER_FIELDS.marginDb);
	let damping: { rd: number; cd: number } | null = null;
	if (f.rd.trim() !== '') damping = { rd: num('rd', f.rd, FILTER_FIELDS.rd), cd: num('cd', f.cd, FILTER_FIELDS.cd) };
	return Object.keys(errors).length ? { value: null, errors } : { value: { l, dcr, c, damping, marginDb }, errors };
}

export function inputFilterOf(nominal: AnalysisDetail, settings: NonNullable<ReturnType<typeof readFilter>['value']>, freqHz: ArrayLike<number>): InputFilterReport {
	return analyzeInputFilter(settings, nominal.plant, nominal.loop, freqHz, nominal.response.metrics.analysedRangeHz);
}
