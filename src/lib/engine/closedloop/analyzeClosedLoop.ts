/**
 * The closed-loop section of the analysis response: closed-loop frequency responses (exact
 * delay), closed-loop poles and stability, load-step and reference-step responses from the
 * linear closed-loop model (delay as Padé), and the load-step rule of thumb beside them.
 * Formulas: docs/formulas.md §8.1–8.3; conventions §0 (T = Gc·Fm·Gvd, the inverting sign left out of Gc).
 */
import type { EngineWarning } from '../errors';
import { bankImpedance, equivalentBranches } from '../plants/capacitorBank';
import type { CapacitorBranch, PlantModel } from '../plants/types';
import { multiply, scale } from '../tf/algebra';
import type { FactoredTf } from '../tf/types';
import { decimate, loadStepResponse, referenceStepResponse, type StepResult } from '../timeresponse/stepResponse';
import { loadStepRuleOfThumb, type RuleOfThumb } from '../timeresponse/ruleOfThumb';
import type { StepFigures } from '../timeresponse/metrics';
import { closedLoopDenominator, closedLoopTf, isStable } from './closedLoopTf';
import { closedLoopResponses, type ClosedLoopResponses } from './responses';
import { roundSignificant } from '../math/displayRounding';
import { formatEng } from '../../units/format';

export interface ClosedLoopInput {
	plant: PlantModel;
	/** Built Gc (from the output voltage, inverting sign removed). */
	compensator: FactoredTf;
	/** Fm·e^(−s·Td). */
	modulator: FactoredTf;
	/** DC divider ratio H = Vref/Vout. */
	dividerRatio: number;
	vout: number;
	capacitors: readonly CapacitorBranch[];
	/** Bode grid, Hz. */
	freqHz: ArrayLike<number>;
	/** Governing crossover and its PM from the margins (for the rule of thumb and the time scale). */
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	loadStep?: LoadStepSettings;
}

export interface LoadStepSettings {
	/** Load-current step ΔI, A (positive = more load) [0.5·iout]. */
	step?: number;
	/** Linear rise time of the load edge, s [1 µs]. */
	riseTime?: number;
	/** Reference step, V [1 % of Vref]. */
	referenceStep?: number;
	/** Simulated time after the step, s [from the closed-loop poles]. */
	duration?: number;
	/** Settling band [0.02]. */
	settleFraction?: number;
}

export interface TransientReport {
	figures: StepFigures;
	/** Decimated waveform for display (≤ 600 points): time from the step start, s; value in V. */
	waveform: { timeS: number[]; value: number[] };
	durationS: number;
}

export interface ClosedLoopSection {
	responses: ClosedLoopResponses;
	/** Closed-loop poles in Hz (s/2π), from the rational model (delay as Padé). */
	polesHz: { re: number; im: number }[];
	stable: boolean;
	padeOrder: number;
	loadStep: (TransientReport & { step: number; riseTimeS: number; ruleOfThumb: RuleOfThumb | null }) | null;
	referenceStep: (TransientReport & { step: number }) | null;
	warnings: EngineWarning[];
}

const DEFAULT_RISE_S = 1e-6;

export function analyzeClosedLoop(input: ClosedLoopInput): ClosedLoopSection {
	const { plant } = input;
	const loop = multiply(input.compensator, input.modulator, plant.gvd);
	const warnings: EngineWarning[] = [];
	const responses = closedLoopResponses(
		{ loop, zo: plant.zo, gvg: plant.gvg, dividerRatio: input.dividerRatio },
		input.freqHz
	);
	const accurateToHz = input.crossoverHz ? 10 * input.crossoverHz : undefined;
	const cl = closedLoopDenominator(loop, { accurateToHz });
	const stable = isStable(cl);
	const polesHz = cl.polesS.map((p) => ({ re: p.re / (2 * Math.PI), im: p.im / (2 * Math.PI) }));

	let loadStep: ClosedLoopSection['loadStep'] = null;
	let referenceStep: ClosedLoopSection['referenceStep'] = null;
	if (!stable) {
		warnings.push({
			code: 'closed-loop-unstable-no-transient',
			message: 'The closed loop is unstable, so no load-step or reference-step response is shown.'
		});
	} else {
		const settings = input.loadStep ?? {};
		const iout = plant.operatingPoint.rLoad > 0 ? input.vout / plant.operatingPoint.rLoad : 0;
		const step = settings.step ?? 0.5 * iout;
		const riseTimeS = settings.riseTime ?? DEFAULT_RISE_S;
		const options = {
			durationS: settings.duration,
			settleFraction: settings.settleFraction,
			bandwidthHz: input.crossoverHz ?? undefined
		};
		const zoCl = closedLoopTf(plant.zo, cl, 'denominator');
		const ls = guarded(() => loadStepResponse(zoCl, step, riseTimeS, options), warnings, 'load step');
		if (ls) {
			const rule = input.crossoverHz ? ruleFor(input, step, riseTimeS) : null;
			loadStep = { ...report(ls), step, riseTimeS, ruleOfThumb: rule };
			if (ls.figures.settlingTimeS === null) {
				warnings.push({ code: 'load-step-not-settled', message: `The load-step response has not settled within ${formatEng(ls.durationS, 's')}.` });
			}
		}
		const refStep = settings.referenceStep ?? 0.01 * input.dividerRatio * input.vout;
		const refTf = scale(closedLoopTf({ gain: 1, originPower: 0, zeros: [], poles: [] }, cl, 'numerator'), 1 / input.dividerRatio);
		const rs = guarded(() => referenceStepResponse(refTf, refStep, options), warnings, 'reference step');
		if (rs) referenceStep = { ...report(rs), step: refStep };
	}
	return { responses, polesHz, stable, padeOrder: cl.padeOrder, loadStep, referenceStep, warnings };
}

/** The figures come from the full waveform; the decimated one for display carries 7 significant digits. */
function report(r: StepResult): TransientReport {
	const w = decimate(r.waveform);
	const digits7 = (x: number) => roundSignificant(x, 7);
	return { figures: r.figures, waveform: { timeS: w.timeS.map(digits7), value: w.value.map(digits7) }, durationS: r.durationS };
}

function guarded(fn: () => StepResult, warnings: EngineWarning[], what: string): StepResult | null {
	try {
		return fn();
	} catch (e) {
		if (!(e instanceof RangeError)) throw e;
		warnings.push({ code: 'transient-unavailable', message: `No ${what} response: ${e.message}` });
		return null;
	}
}

function ruleFor(input: ClosedLoopInput, step: number, riseTimeS: number): RuleOfThumb {
	const fc = input.crossoverHz as number;
	const branches = equivalentBranches(input.capacitors);
	const cTotal = branches.reduce((a, b) => a + b.c, 0);
	const [esr] = bankImpedance(branches, 2 * Math.PI * fc);
	return loadStepRuleOfThumb({
		deltaI: step,
		crossoverHz: fc,
		cTotal,
		esr,
		phaseMarginDeg: input.phaseMarginDeg,
		esrZeroHz: input.plant.features.esrZeroHz,
		riseTimeS
	});
}

