/**
 * The uncertain parameters of a fit, mapped onto a loop spec (corners/variation.ts does the
 * moving, so a fitted value means what a tolerance corner means). Multiplicative parameters are
 * fitted as θ = ln(value/typed), which keeps them positive and makes a step a relative change;
 * the loop delay, whose typed value is often 0, as θ = delay·fsw (switching periods).
 */
import type { DesignDocument } from '../contract/designSchema';
import { MAX_DELAY_PERIODS } from '../contract/designSchema';
import type { LoopSpec } from '../corners/loopModel';
import { applyVariation, partLabel, type Variation } from '../corners/variation';
import { BRANCH_PARAMETERS, type FitParameterName, type FitParameterSpec } from './schema';

/**
 * Default search range (× typed). Deliberately wider than a part's tolerance: a fit held inside
 * the tolerance would pin the part that is really off at the limit and let the others take up
 * the rest; the result says instead whether the fitted value lies outside the tolerance.
 */
export const DEFAULT_FACTOR_RANGE = { min: 0.25, max: 4 } as const;

export interface ResolvedParameter {
	name: FitParameterName;
	branch: number | null;
	/** "ESR (branch 2)". */
	label: string;
	unit: string;
	/** Dotted path of the value in the design document. */
	path: string;
	/** The value the model used before the fit (effective C for a capacitor branch). */
	typed: number;
	kind: 'log' | 'delay';
	/** θ bounds and start. */
	lower: number;
	upper: number;
	start: number;
	/** Where the bounds came from. */
	boundsFrom: 'request' | 'default';
	/** The document's tolerance for the part (fraction), null when it states none or for the delay. */
	tolerance: number | null;
}

const UNITS: Record<FitParameterName, string> = { l: 'H', dcr: 'Ω', c: 'F', esr: 'Ω', esl: 'H', vramp: 'V', senseGain: 'V/A', rampSlope: 'V/s', delay: 's' };
const CURRENT_LOOP: readonly FitParameterName[] = ['senseGain', 'rampSlope'];

export type ResolveResult = { ok: true; parameters: ResolvedParameter[] } | { ok: false; fields: Record<string, string> };

export function resolveParameters(specs: readonly FitParameterSpec[], spec: LoopSpec, doc: DesignDocument, plantOnly: boolean): ResolveResult {
	const fields: Record<string, string> = {};
	const out: ResolvedParameter[] = [];
	const branches = spec.stage.capacitors.length;
	specs.forEach((p, k) => {
		const at = `parameters.${k}`;
		const isBranch = BRANCH_PARAMETERS.includes(p.name);
		const branch = isBranch ? (p.branch ?? 0) : null;
		if (branch !== null && branch >= branches) {
			fields[`${at}.branch`] = `the bank has ${branches} branch${branches === 1 ? '' : 'es'} (0…${branches - 1})`;
			return;
		}
		const currentMode = spec.modulator.currentMode !== undefined;
		if (p.name === 'vramp' && currentMode) {
			fields[`${at}.name`] = 'peak current mode uses no PWM ramp: fit Ri (senseGain) or Se (rampSlope) instead';
			return;
		}
		if (CURRENT_LOOP.includes(p.name) && !currentMode) {
			fields[`${at}.name`] = 'exists only in peak current mode (modulator.control "peak-current")';
			return;
		}
		if (plantOnly && (p.name === 'vramp' || p.name === 'delay')) {
			fields[`${at}.name`] = 'the plant response Gvd does not depend on the modulator: fit it to a loop-gain or output-impedance measurement';
			return;
		}
		const fsw = spec.stage.fswHz;
		if (p.name === 'delay') {
			const lowS = p.min ?? 0;
			const highS = p.max ?? MAX_DELAY_PERIODS / fsw;
			if (highS * fsw > MAX_DELAY_PERIODS) {
				fields[`${at}.max`] = `must be ≤ ${MAX_DELAY_PERIODS} switching periods`;
				return;
			}
			out.push({
				name: 'delay', branch: null, label: partLabel('delay', null, branches), unit: 's', path: 'modulator.delay',
				typed: spec.modulator.delayS, kind: 'delay',
				lower: lowS * fsw, upper: highS * fsw, start: Math.min(Math.max(spec.modulator.delayS * fsw, lowS * fsw), highS * fsw),
				boundsFrom: p.min !== undefined || p.max !== undefined ? 'request' : 'default',
				tolerance: null
			});
			return;
		}
		const typed = typedValue(spec, p.name, branch);
		if (!(typed > 0)) {
			fields[`${at}.name`] = `${partLabel(p.name, branch, branches)} is 0 in the design: type a first estimate before fitting it`;
			return;
		}
		let range: { min: number; max: number } = DEFAULT_FACTOR_RANGE;
		let boundsFrom: ResolvedParameter['boundsFrom'] = 'default';
		if (p.min !== undefined || p.max !== undefined) {
			range = { min: p.min ?? DEFAULT_FACTOR_RANGE.min, max: p.max ?? DEFAULT_FACTOR_RANGE.max };
			boundsFrom = 'request';
		}
		if (!(range.min < 1 && range.max > 1)) {
			fields[`${at}.min`] = 'the range must contain the typed value (min < 1 < max)';
			return;
		}
		out.push({
			name: p.name, branch, label: partLabel(p.name, branch, branches), unit: UNITS[p.name], path: documentPath(p.name, branch),
			typed, kind: 'log', lower: Math.log(range.min), upper: Math.log(range.max), start: 0, boundsFrom,
			tolerance: doc.tolerances?.[p.name]?.tol ?? null
		});
	});
	return Object.keys(fields).length ? { ok: false, fields } : { ok: true, parameters: out };
}

function typedValue(spec: LoopSpec, name: FitParameterName, branch: number | null): number {
	const s = spec.stage;
	switch (name) {
		case 'l': return s.l;
		case 'dcr': return s.dcr;
		case 'vramp': return spec.modulator.vramp;
		case 'senseGain': case 'rampSlope': return spec.modulator.currentMode?.[name] ?? 0;
		case 'c': case 'esr': case 'esl': return s.capacitors[branch ?? 0][name];
		case 'delay': return spec.modulator.delayS;
	}
}

export function documentPath(name: FitParameterName, branch: number | null): string {
	switch (name) {
		case 'l': return 'plant.inductor.l';
		case 'dcr': return 'plant.inductor.dcr';
		case 'vramp': return 'modulator.vramp';
		case 'senseGain': return 'modulator.senseGain';
		case 'rampSlope': return 'modulator.rampSlope';
		case 'delay': return 'modulator.delay';
		default: return `plant.capacitors.${branch ?? 0}.${name}`;
	}
}

/** The parameter's value at θ. */
export const valueAt = (p: ResolvedParameter, theta: number, fswHz: number) => (p.kind === 'delay' ? theta / fswHz : p.typed * Math.exp(theta));

/** The loop spec with every parameter at θ (plus the measurement's operating point in `base`). */
export function specAt(spec: LoopSpec, params: readonly ResolvedParameter[], theta: readonly number[], base: Variation = {}): LoopSpec {
	const factors: NonNullable<Variation['factors']> = {};
	const n = spec.stage.capacitors.length;
	const branchFactors = { c: new Array<number>(n).fill(1), esr: new Array<number>(n).fill(1), esl: new Array<number>(n).fill(1) };
	let delayS = spec.modulator.delayS;
	params.forEach((p, k) => {
		if (p.kind === 'delay') delayS = theta[k] / spec.stage.fswHz;
		else if (p.branch !== null) branchFactors[p.name as 'c' | 'esr' | 'esl'][p.branch] = Math.exp(theta[k]);
		else factors[p.name as 'l' | 'dcr' | 'vramp' | 'senseGain' | 'rampSlope'] = Math.exp(theta[k]);
	});
	const moved = applyVariation(spec, { ...base, factors, branchFactors });
	return { ...moved, modulator: { ...moved.modulator, delayS } };
}
