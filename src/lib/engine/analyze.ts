/**
 * The whole analysis pipeline: design document → validated input → averaged power stage
 * (plants/) → modulator → compensator (compensators/) → loop T = Gc·Fm·Gvd·e^(−sTd) →
 * Bode data on the requested sweep and loop metrics (analysis/) → contract response.
 * Errors come back as the contract's error object, never thrown. Every number is finite.
 */
import type { LoopMetrics } from './analysis/margins';
import { resolveParsedCompensator, CompensatorDesignError, type ResolvedCompensator } from './compensators';
import { contractError, zodFields, type ContractError } from './contract/errors';
import { DEFAULT_SWEEP_POINTS, designDocumentSchema, type DesignDocument } from './contract/designSchema';
import type { AnalysisResponse } from './contract/responseSchema';
import { DesignInputError, type EngineWarning } from './errors';
import { modulatorTf, rampAmplitude } from './plants/modulator';
import { controlledStage } from './plants/controlledStage';
import type { CurrentModePlant } from './plants/currentMode';
import type { PlantModel } from './plants/types';
import { defaultSweepRange, logGrid } from './sweep/grid';
import { multiply } from './tf/algebra';
import { frequencyResponse } from './tf/evaluate';
import { robustnessSections } from './closedloop/sections';
import { capacitorDeratingOf, cornerPlantLoops, hasDerating, modulatorInputOf, stageInputOf } from './pipeline/documentModel';
import type { FactoredTf } from './tf/types';
import { formatDb, formatEng } from '../units/format';
import { plausibilityWarnings } from './contract/plausibility';
import { lossBreakdown } from './plants/losses';

export interface AnalyzeOptions {
	/** Compute the Bode arrays [true]; false leaves them empty (faster, for batch runs). */
	includeResponse?: boolean;
	/** Add the closed-loop section (responses, poles, load and reference steps) [includeResponse,
	 * or true when the document has a loadStep section]. */
	closedLoop?: boolean;
	/** Run the corners, inputFilter and spread sections the document asks for [true]. */
	sections?: boolean;
	/**
	 * Gc of the document's built network on the document's sweep, when the caller already has it
	 * (the same fixed parts analysed at several operating cases: Gc does not depend on the case,
	 * so it is evaluated once). Used as given; the caller answers for it being that network's.
	 */
	networkResponse?: { magDb: ArrayLike<number>; phaseDeg: ArrayLike<number> };
	/** Closed-loop poles in the metrics [true]; false keeps the stability verdict (Routh–Hurwitz when clearly stable) and leaves the poles out. */
	closedLoopPoles?: boolean;
}

/** Everything the pipeline built, for callers that need the transfer functions too. */
export interface AnalysisDetail {
	response: AnalysisResponse;
	document: DesignDocument;
	plant: PlantModel;
	/** Fm·Gvd·e^(−sTd): the loop without the compensator. */
	plantLoop: FactoredTf;
	compensator: ResolvedCompensator;
	/** T = Gc·Fm·Gvd·e^(−sTd). */
	loop: FactoredTf;
	metrics: LoopMetrics;
}

/** Analyse a design document (any JSON value): the contract response or the contract error. */
export function analyzeDesign(doc: unknown, options: AnalyzeOptions = {}): AnalysisResponse | ContractError {
	const r = analyzeDesignDetailed(doc, options);
	return 'error' in r ? r : r.response;
}

export function analyzeDesignDetailed(doc: unknown, options: AnalyzeOptions = {}): AnalysisDetail | ContractError {
	const parsed = designDocumentSchema.safeParse(doc);
	if (!parsed.success) return contractError(zodFields(parsed.error));
	return analyzeValidatedDesign(parsed.data, options);
}

/**
 * Analyse a document that designDocumentSchema has already accepted (its parse output, defaults
 * filled): for batch callers that validate once and analyse many times. The rules that need the
 * model (duty, maximum boost gain) are still checked here and come back as the contract error.
 */
export function analyzeValidatedDesign(document: DesignDocument, options: AnalyzeOptions = {}): AnalysisDetail | ContractError {
	try {
		return run(document, options);
	} catch (e) {
		if (e instanceof DesignInputError) return contractError(e.fields);
		if (e instanceof CompensatorDesignError) return contractError(e.fields, e.code, e.message);
		// Never crash a caller: an unexpected numerical failure is reported, not thrown.
		const message = e instanceof Error ? e.message : String(e);
		return contractError({ '(engine)': message }, 'analysis-failed', `The engine could not analyse this design: ${message}`);
	}
}

function run(d: DesignDocument, options: AnalyzeOptions): AnalysisDetail {
	const p = d.plant;
	const mod = modulatorInputOf(d);
	const plant = controlledStage(stageInputOf(d), mod);
	const plantLoop = multiply(modulatorTf(mod, p.vin), plant.gvd);

	// Plot grid: the document's sweep, or two decades below f0 to fsw/2 (400 points).
	const include = options.includeResponse ?? true;
	const s = d.sweep;
	let lo: number;
	let hi: number;
	let freqHz: Float64Array | null = null;
	if (s && 'freqHz' in s) {
		freqHz = Float64Array.from(s.freqHz);
		// A loop, not Math.min(...list): spreading a 400-point list copies it into the call's
		// arguments, twice per operating case on every keystroke of the design screen.
		lo = Infinity;
		hi = -Infinity;
		for (let i = 0; i < freqHz.length; i++) {
			if (freqHz[i] < lo) lo = freqHz[i];
			if (freqHz[i] > hi) hi = freqHz[i];
		}
	} else {
		const r = s ?? { ...defaultSweepRange(plant.features.f0Hz, p.fsw), points: DEFAULT_SWEEP_POINTS };
		lo = r.startHz;
		hi = r.stopHz;
		if (include) freqHz = logGrid(r.startHz, r.stopHz, r.points);
	}

	// Metrics range: the sweep widened to [f0/100, 10·fsw], so margins above fsw/2 are found
	// (and flagged) rather than silently missed. The compensator analyses the built loop once over
	// this range joined with its own check range, and those metrics are the response's.
	const wanted = { startHz: Math.min(lo, plant.features.f0Hz / 100), stopHz: Math.max(hi, 10 * p.fsw) };
	const compensator = resolveParsedCompensator(d.compensator, {
		plant: plantLoop,
		fswHz: p.fsw,
		features: plant.features,
		vout: p.vout,
		vref: d.feedback.vref,
		r1: d.feedback.r1,
		metricsRangeHz: wanted,
		closedLoopPoles: options.closedLoopPoles,
		cornerPlants: d.compensator.target?.placeFor === 'worst-corner' ? cornerPlantLoops(d) : undefined
	});
	const loop = compensator.builtLoop;
	const metrics = compensator.builtLoopMetrics;
	const range = compensator.builtLoopRangeHz;

	// Bode data. The loop is the exact sum of compensator and plant-loop terms in dB and degrees
	// (factored form), so it costs no extra evaluation.
	const empty = { magDb: [] as number[], phaseDeg: [] as number[] };
	let plantBode = empty;
	let compBode = empty;
	let loopBode = empty;
	let freqList: number[] = [];
	if (include && freqHz) {
		const gp = frequencyResponse(plant.gvd, freqHz);
		const gc = options.networkResponse ?? frequencyResponse(compensator.built, freqHz);
		const fmDb = 20 * Math.log10(modulatorTf(mod, p.vin).gain);
		const delayDegPerHz = -360 * mod.delayS;
		const n = freqHz.length;
		// Plain loops into plain arrays: Array.from(typedArray, fn) is slow in V8.
		freqList = new Array<number>(n);
		const pm = new Array<number>(n);
		const pp = new Array<number>(n);
		const cm = new Array<number>(n);
		const cp = new Array<number>(n);
		const lm = new Array<number>(n);
		const lp = new Array<number>(n);
		for (let i = 0; i < n; i++) {
			freqList[i] = freqHz[i];
			pm[i] = clampDb(gp.magDb[i]);
			pp[i] = finiteOr0(gp.phaseDeg[i]);
			cm[i] = clampDb(gc.magDb[i]);
			cp[i] = finiteOr0(gc.phaseDeg[i]);
			lm[i] = clampDb(gp.magDb[i] + gc.magDb[i] + fmDb);
			lp[i] = finiteOr0(gp.phaseDeg[i] + gc.phaseDeg[i] + delayDegPerHz * freqHz[i]);
		}
		plantBode = { magDb: pm, phaseDeg: pp };
		compBode = { magDb: cm, phaseDeg: cp };
		loopBode = { magDb: lm, phaseDeg: lp };
	}

	const op = plant.operatingPoint;
	const response: AnalysisResponse = {
		schemaVersion: 1,
		operatingPoint: {
			duty: op.duty,
			efficiency: op.efficiency,
			rippleCurrent: op.rippleCurrent,
			mode: op.mode,
			inductorCurrent: op.inductorCurrent,
			loadResistance: op.rLoad,
			seriesResistance: op.rSeries,
			outputRipple: op.outputRipple.total,
			outputRippleCapacitive: op.outputRipple.capacitive,
			outputRippleEsr: op.outputRipple.esr,
			criticalInductance: op.criticalInductance,
			criticalLoadResistance: op.criticalLoadResistance,
			criticalLoadCurrent: op.criticalLoadCurrent,
			// Peak current mode: the compensation ramp's rise over one period at the comparator (Se·Ts).
			rampAmplitude: mod.currentMode ? mod.currentMode.rampSlope / p.fsw : rampAmplitude(mod, p.vin)
		},
		features: {
			f0Hz: plant.features.f0Hz,
			q: finiteOr0(plant.features.q),
			esrZeroHz: plant.features.esrZeroHz,
			rhpZeroHz: plant.features.rhpZeroHz,
			selfResonanceHz: plant.features.selfResonanceHz,
			...currentModeOf(plant)
		},
		compensator: {
			kind: compensator.kind,
			ideal: compensator.ideal,
			rounded: compensator.rounded,
			placement: stripUndefined(compensator.placement)
		},
		response: {
			freqHz: freqList,
			plant: plantBode,
			compensator: compBode,
			loop: loopBode
		},
		metrics: {
			crossoverHz: metrics.crossoverHz,
			phaseMarginDeg: metrics.phaseMarginDeg,
			gainMarginDb: metrics.gainMarginDb,
			phaseCrossoverHz: metrics.phaseCrossoverHz,
			delayMarginS: metrics.delayMarginS,
			gainReductionMarginDb: metrics.gainReductionMarginDb,
			modulusMargin: metrics.modulusMargin,
			modulusMarginHz: metrics.modulusMarginHz,
			crossovers: metrics.crossovers.map((x) => ({ freqHz: x.freqHz, phaseMarginDeg: x.phaseMarginDeg, direction: x.direction })),
			phaseCrossovers: metrics.phaseCrossovers.map((x) => ({ freqHz: x.freqHz, gainMarginDb: clampDb(x.gainMarginDb), direction: x.direction })),
			closedLoopStable: metrics.closedLoopStable,
			closedLoopPolesHz: (metrics.closedLoop?.poles ?? [])
				.filter((z) => Number.isFinite(z.re) && Number.isFinite(z.im))
				.map((z) => ({ re: z.re / (2 * Math.PI), im: z.im / (2 * Math.PI) })),
			padeOrder: metrics.closedLoop?.padeOrder ?? 0,
			analysedRangeHz: range,
			unavailable: { ...metrics.unavailable } as Record<string, string>
		},
		warnings: mergeWarnings(plausibilityWarnings(d), plant.warnings, compensator.warnings, loopWarnings(metrics, p.fsw))
	};
	if (hasDerating(d)) response.capacitorDerating = capacitorDeratingOf(d);
	response.losses = lossBreakdown({
		topology: p.topology,
		vin: p.vin,
		vout: p.vout,
		iout: p.iout,
		fswHz: p.fsw,
		dcr: p.inductor.dcr,
		rdsOn: p.rdsOn,
		inductorCurrent: plant.operatingPoint.inductorCurrent,
		rippleCurrent: plant.operatingPoint.rippleCurrent,
		duty: plant.operatingPoint.duty,
		rectifier: p.lightLoad === 'diode' ? 'diode' : 'synchronous',
		parts: p.losses
	}) as AnalysisResponse['losses'];
	const detail: AnalysisDetail = { response, document: d, plant, plantLoop, compensator, loop, metrics };
	// Robustness sections: only when asked for, so batch runs (includeResponse: false) stay cheap.
	const extra = robustnessSections(detail, { closedLoop: options.closedLoop ?? (include || d.loadStep !== undefined), sections: options.sections });
	if (extra.closedLoop) response.closedLoop = extra.closedLoop;
	if (extra.corners) response.corners = extra.corners;
	if (extra.inputFilter) {
		response.inputFilter = extra.inputFilter;
		// Checked against the switching simulation (reference/currentmode/out/input-impedance.json):
		// the buck's ZD holds to 0.5 dB / 5° up to fsw/10, the boost's phase departs by about 13° at fsw/20.
		if (mod.currentMode && p.topology === 'boost') {
			extra.warnings.push({
				code: 'input-filter-current-mode-boost',
				message: `The input-filter check uses the boost's input impedance ZD with the current loop closed; against a switching simulation its magnitude holds within 2 dB up to fsw/5 but its phase departs by about 13° at fsw/20 (${formatEng(p.fsw / 20, 'Hz')}) and more above, so treat the filter's effect on the loop there as indicative.`
			});
		}
	}
	if (extra.spread) response.spread = extra.spread;
	if (extra.warnings.length) response.warnings = mergeWarnings(response.warnings, extra.warnings);
	return detail;
}

/** Warnings from the loop metrics that the compensator module does not already give. */
function loopWarnings(m: LoopMetrics, fswHz: number): EngineWarning[] {
	const out: EngineWarning[] = [];
	const half = fswHz / 2;
	if (m.closedLoopStable === false) {
		out.push({ code: 'closed-loop-unstable', message: 'The closed loop has a pole in the right half plane (roots of 1 + T): it is unstable.' });
	}
	if (m.crossoverHz !== null && m.crossoverHz > half) {
		out.push({ code: 'crossover-above-fsw-half', message: `A crossover sits at ${formatEng(m.crossoverHz, 'Hz')}, above fsw/2 where the averaged model is not trusted.` });
	}
	if (m.phaseCrossoverHz !== null && m.phaseCrossoverHz > half) {
		out.push({ code: 'gain-margin-above-fsw-half', message: `The gain margin is taken at ${formatEng(m.phaseCrossoverHz, 'Hz')}, above fsw/2 where the averaged model is not trusted; treat it as indicative.` });
	}
	if (m.gainMarginDb !== null && m.gainMarginDb < 6) {
		out.push({ code: 'gain-margin-low', message: `Gain margin ${formatDb(m.gainMarginDb)} is below the usual 6 dB minimum.` });
	}
	if (m.modulusMargin !== null && m.modulusMargin < 0.4 && m.closedLoopStable !== false) {
		out.push({ code: 'modulus-margin-low', message: `min |1 + T| = ${m.modulusMargin.toFixed(2)}: the Nyquist curve passes close to −1 (peak sensitivity ${(1 / m.modulusMargin).toFixed(1)}).` });
	}
	return out;
}

function mergeWarnings(...lists: EngineWarning[][]): EngineWarning[] {
	// A handful of warnings: a linear duplicate check beats building code|message keys.
	const out: EngineWarning[] = [];
	for (const list of lists) {
		for (const w of list) {
			let dup = false;
			for (const o of out) {
				if (o.code === w.code && o.message === w.message) {
					dup = true;
					break;
				}
			}
			if (!dup) out.push({ code: w.code, message: w.message });
		}
	}
	return out;
}

/** features.currentMode of a peak current-mode plant (qp null when mc·D′ = 0.5 exactly). */
function currentModeOf(plant: PlantModel): { currentMode?: AnalysisResponse['features']['currentMode'] } {
	const cm = (plant as Partial<CurrentModePlant>).currentMode;
	return cm ? { currentMode: { ...cm } } : {};
}

const clampDb = (x: number) => (Number.isNaN(x) ? -1000 : Math.max(-1000, Math.min(1000, x)));
const finiteOr0 = (x: number) => (Number.isFinite(x) ? x : 0);

function stripUndefined(o: object): Record<string, string | number> {
	const out: Record<string, string | number> = {};
	const record = o as Record<string, unknown>;
	for (const k in record) {
		const v = record[k];
		if (typeof v === 'string' || (typeof v === 'number' && Number.isFinite(v))) out[k] = v;
	}
	return out;
}
