/**
 * Corner analysis: the operating cases (operatingCases.ts: Vin {min, nom, max} × Iout
 * {min, nom, max}) and the tolerance corners of the parts (each at 1 ± tol). All sign
 * combinations of the tolerances are run when their count fits `maxCorners`; otherwise each part
 * alone at ±tol, plus, per metric, the combination whose one-at-a-time effects all worsen that
 * metric (a linearised worst case, labelled as such). Margins from analysis/margins (the
 * governing-margin rule, docs/formulas.md §7); worst fc (lowest and highest), PM and GM with the corner
 * that sets each; the warnings raised at each corner; the loop traces of the worst corners.
 */
import { OUTSIDE_MODEL_CODE } from '../plants/powerStage';
import { loopMetrics, type LoopMetrics } from '../analysis/margins';
import { isDesignInputError, type EngineWarning } from '../errors';
import { frequencyResponse } from '../tf/evaluate';
import { buildLoop, type BuiltLoop, type LoopSpec } from './loopModel';
import { cornerLabel, operatingCases, type CaseName } from './operatingCases';
import { applyVariation, partsPresent, type PartName, type Variation } from './variation';

/** Extra checks run at every corner (op-amp bandwidth, input filter …): warnings for that corner. */
/** A check run at every corner; `variation` says which operating case and part factors it is. */
export type CornerCheck = (built: BuiltLoop, metrics: LoopMetrics, spec: LoopSpec, variation: Variation) => EngineWarning[];

export interface CornerSettings {
	vin?: { min: number; max: number };
	iout?: { min: number; max: number };
	/** Temperature range, °C (nominal 25 °C). */
	temperature?: { min: number; max: number };
	/** Relative tolerance (0.1 = ±10 %) per part; parts the loop lacks are ignored. */
	tolerances?: Partial<Record<PartName, number>>;
	/** Limit on the number of corners before falling back to one-at-a-time [4096]. */
	maxCorners?: number;
	/** Checks beyond the plant's own warnings, run at every corner. */
	checks?: CornerCheck;
}

export interface CornerPoint {
	vin: number;
	iout: number;
	vinCase: CaseName;
	ioutCase: CaseName;
	/** Part temperature, °C, and its case (only with a temperature range). */
	temperatureC?: number;
	tempCase?: CaseName;
	/** Multiplier applied to each toleranced part (only parts ≠ 1 listed). */
	factors: Partial<Record<PartName, number>>;
	/** How the corner was chosen. */
	kind: 'nominal' | 'operating' | 'exhaustive' | 'one-at-a-time' | 'linearised-worst';
	/** "Vin max, Iout min, L −20 %" (operatingCases.ts cornerLabel). */
	label: string;
}

export interface CornerResult extends CornerPoint {
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	gainMarginDb: number | null;
	closedLoopStable: boolean | null;
	/** Warning codes raised at this corner (plant model and checks, e.g. dcm-operating-point). */
	warnings: string[];
	/** The design cannot be modelled here (e.g. duty limit); metrics are null. */
	error: string | null;
}

export interface WorstCase {
	value: number;
	corner: CornerResult;
}

export interface CornerReport {
	mode: 'exhaustive' | 'one-at-a-time';
	corners: CornerResult[];
	worst: {
		phaseMarginDeg: WorstCase | null;
		gainMarginDb: WorstCase | null;
		crossoverLowHz: WorstCase | null;
		crossoverHighHz: WorstCase | null;
	};
	/** Any corner unstable or not modelled. */
	unstableCorners: number;
	failedCorners: number;
	/** The message of each warning code raised at a corner (its first occurrence). */
	warningMessages: Record<string, string>;
	/** Loop Bode traces of the nominal and the worst corners, for overlaid plots. */
	traces: { label: string; corner: CornerPoint; magDb: number[]; phaseDeg: number[] }[];
}

type VariantResult = Omit<CornerResult, keyof CornerPoint> & { messages: EngineWarning[] };

/** Metrics and warnings of one variant of the loop. */
export function evaluateVariant(spec: LoopSpec, v: Variation, checks?: CornerCheck): VariantResult {
	try {
		const s = applyVariation(spec, v);
		const built = buildLoop(s);
		const m = loopMetrics(built.loop, s.rangeHz);
		const messages = checks ? [...built.plant.warnings, ...checks(built, m, s, v)] : built.plant.warnings;
		return {
			crossoverHz: m.crossoverHz,
			phaseMarginDeg: m.phaseMarginDeg,
			gainMarginDb: m.gainMarginDb,
			closedLoopStable: m.closedLoopStable,
			warnings: messages.map((w) => w.code),
			messages,
			error: null
		};
	} catch (e) {
		if (!isDesignInputError(e) && !(e instanceof RangeError)) throw e;
		return { crossoverHz: null, phaseMarginDeg: null, gainMarginDb: null, closedLoopStable: null, warnings: [], messages: [], error: e.message };
	}
}

export function runCorners(spec: LoopSpec, settings: CornerSettings, freqHz?: ArrayLike<number>): CornerReport {
	const ops = operatingCases({ vin: spec.stage.vin, iout: spec.stage.iout, vinRange: settings.vin, ioutRange: settings.iout, temperatureRange: settings.temperature });
	const present = new Set(partsPresent(spec));
	const tol = Object.entries(settings.tolerances ?? {}).filter(
		([name, t]) => present.has(name as PartName) && typeof t === 'number' && t > 0
	) as [PartName, number][];
	const maxCorners = settings.maxCorners ?? 4096;
	const exhaustive = ops.length * 2 ** tol.length <= maxCorners;

	const corners: CornerResult[] = [];
	const warningMessages: Record<string, string> = {};
	const run = (p: Omit<CornerPoint, 'label'>) => {
		const { messages, ...metrics } = evaluateVariant(spec, { vin: p.vin, iout: p.iout, temperatureC: p.temperatureC, factors: p.factors }, settings.checks);
		for (const w of messages) warningMessages[w.code] ??= w.message;
		const r: CornerResult = { ...p, label: cornerLabel(p), ...metrics };
		corners.push(r);
		return r;
	};
	const nominal = ops[0];
	run({ vin: nominal.vin, iout: nominal.iout, vinCase: 'nom', ioutCase: 'nom', ...(nominal.tempCase ? { temperatureC: nominal.temperatureC, tempCase: nominal.tempCase } : {}), factors: {}, kind: 'nominal' });
	for (const o of ops) {
		if (o.nominal && tol.length === 0) continue;
		const op = { vin: o.vin, iout: o.iout, vinCase: o.vinCase, ioutCase: o.ioutCase, ...(o.tempCase ? { temperatureC: o.temperatureC, tempCase: o.tempCase } : {}) };
		if (exhaustive) {
			for (let mask = 0; mask < 2 ** tol.length; mask++) {
				const factors: Partial<Record<PartName, number>> = {};
				tol.forEach(([name, t], i) => (factors[name] = mask & (1 << i) ? 1 + t : 1 - t));
				run({ ...op, factors, kind: tol.length ? 'exhaustive' : 'operating' });
			}
			continue;
		}
		const centre = o.nominal ? corners[0] : run({ ...op, factors: {}, kind: 'operating' });
		// One part at a time, then the linearised worst combination per metric.
		const effect: Record<string, { up: CornerResult; down: CornerResult }> = {};
		for (const [name, t] of tol) {
			effect[name] = {
				up: run({ ...op, factors: { [name]: 1 + t }, kind: 'one-at-a-time' }),
				down: run({ ...op, factors: { [name]: 1 - t }, kind: 'one-at-a-time' })
			};
		}
		const metrics: [keyof CornerResult, 1 | -1][] = [
			['phaseMarginDeg', -1],
			['gainMarginDb', -1],
			['crossoverHz', -1],
			['crossoverHz', 1]
		];
		for (const [metric, worse] of metrics) {
			const factors: Partial<Record<PartName, number>> = {};
			for (const [name, t] of tol) {
				const up = effect[name].up[metric] as number | null;
				const down = effect[name].down[metric] as number | null;
				const c = centre[metric] as number | null;
				if (up === null || down === null || c === null) continue;
				factors[name] = worse * (up - down) >= 0 ? 1 + t : 1 - t;
			}
			run({ ...op, factors, kind: 'linearised-worst' });
		}
	}

	const pick = (key: 'phaseMarginDeg' | 'gainMarginDb' | 'crossoverHz', sign: 1 | -1): WorstCase | null => {
		let best: WorstCase | null = null;
		for (const c of corners) {
			const v = c[key];
			// A corner outside the model (DCM the document says it enters) has no valid margins.
			if (v === null || c.warnings.includes(OUTSIDE_MODEL_CODE)) continue;
			if (!best || sign * v < sign * best.value) best = { value: v, corner: c };
		}
		return best;
	};
	const worst = {
		phaseMarginDeg: pick('phaseMarginDeg', 1),
		gainMarginDb: pick('gainMarginDb', 1),
		crossoverLowHz: pick('crossoverHz', 1),
		crossoverHighHz: pick('crossoverHz', -1)
	};
	const traces: CornerReport['traces'] = [];
	if (freqHz) {
		const grid = Float64Array.from(freqHz);
		const add = (label: string, c: CornerPoint | undefined) => {
			if (!c) return;
			try {
				const r = frequencyResponse(buildLoop(applyVariation(spec, c)).loop, grid);
				traces.push({ label, corner: strip(c), magDb: Array.from(r.magDb), phaseDeg: Array.from(r.phaseDeg) });
			} catch (e) {
				if (!isDesignInputError(e) && !(e instanceof RangeError)) throw e;
			}
		};
		add('nominal', corners[0]);
		add('worst phase margin', worst.phaseMarginDeg?.corner);
		add('worst gain margin', worst.gainMarginDb?.corner);
		add('lowest crossover', worst.crossoverLowHz?.corner);
		add('highest crossover', worst.crossoverHighHz?.corner);
	}
	return {
		mode: exhaustive ? 'exhaustive' : 'one-at-a-time',
		corners,
		worst,
		unstableCorners: corners.filter((c) => c.closedLoopStable === false && !c.warnings.includes(OUTSIDE_MODEL_CODE)).length,
		failedCorners: corners.filter((c) => c.error !== null).length,
		warningMessages,
		traces
	};
}

const strip = (c: CornerPoint): CornerPoint => ({ vin: c.vin, iout: c.iout, vinCase: c.vinCase, ioutCase: c.ioutCase, ...(c.tempCase ? { temperatureC: c.temperatureC, tempCase: c.tempCase } : {}), factors: c.factors, kind: c.kind, label: c.label });
