/**
 * The design screen's robustness panels: their inputs (typed text, read with the units parser
 * into SI values or field errors) and the engine runs behind them — closed-loop responses and
 * steps of the nominal design, the Monte Carlo configuration for the worker (the document's own
 * spread settings) and the input-filter check. The corners come with the verdict (verifier.ts). All engine work is the shared
 * engine's (closedloop/, corners/, spread/, inputfilter/); this module only wires it.
 */
import { spreadTargetsOf, targetsOf, type AnalysisDetail, type DesignDocument } from '$lib/engine';
import { robustnessSections, type ClosedLoopReport } from '$lib/engine/closedloop/sections';
import { loopSpecFromDetail, type LoopSpec } from '$lib/engine/corners/loopModel';
import type { PartName } from '$lib/engine/corners/variation';
import { analyzeInputFilter, type InputFilterReport } from '$lib/engine/inputfilter/analyzeInputFilter';
import { DEFAULT_SAMPLES, type PartTolerance, type SpreadConfig } from '$lib/engine/spread/spread';
import { parseQuantity } from '$lib/units';
import type { FieldSpec } from './form';

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

export { TOL_SPEC, readTolerances, presentRows, type ToleranceRow } from './tolerances';

export function specOf(nominal: AnalysisDetail): LoopSpec {
	return loopSpecFromDetail(nominal);
}

// ---------------------------------------------------------------- Monte Carlo


/**
 * The spread run of the design screen: exactly the document's spread settings, tolerances and
 * yield targets (the same run the stored verdict makes), for the worker.
 */
export function spreadConfigOf(doc: DesignDocument): Read<SpreadConfig> {
	const t = doc.tolerances ?? {};
	const tolerances: Partial<Record<PartName, PartTolerance>> = {};
	for (const [name, x] of Object.entries(t)) if (x && x.tol > 0) tolerances[name as PartName] = { tol: x.tol, dist: x.dist, sigmas: x.sigmas };
	if (Object.keys(tolerances).length === 0) return { value: null, errors: { tolerances: 'give at least one part a tolerance > 0 %' } };
	const s = doc.spread ?? { samples: DEFAULT_SAMPLES, seed: 1, bins: 40, targets: undefined };
	return {
		value: { samples: s.samples, seed: s.seed, tolerances, targets: s.targets ?? spreadTargetsOf(targetsOf(doc), doc.plant.fsw), bins: s.bins },
		errors: {}
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
	rd: { label: 'Rd (damping)', unit: 'Ω', positive: true, hint: 'empty = no damping', optional: true },
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
