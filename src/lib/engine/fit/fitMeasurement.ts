/**
 * Fits the parameters an engineer marks uncertain to a measured response (docs/formulas.md §11).
 *
 * Residual at each measured point: the complex log ratio ln(H_meas/H_model), split into its real
 * part Δln|H| (nepers; 1 Np = 8.69 dB) and imaginary part Δ∠H (rad, reduced to (−π, π] so a
 * whole-turn offset between two unwrapped curves is no error). Both are dimensionless and weigh
 * 1 dB like 6.6°, which is about how an analyser's magnitude and phase noise compare. The robust
 * loss (soft-L1) keeps a few bad points (a resonance of the injection set-up, a range switch of
 * the analyser) from dragging the fit.
 *
 * Intervals: the covariance of θ is s²·(JᵀWJ)⁻¹ with J the Jacobian of the residuals, W the loss
 * weights ρ′(r²) at the solution and s² = Σ wᵢ·rᵢ²/(m − p) the weighted residual variance
 * (the sandwich-free Gauss–Newton estimate, [published: Seber & Wild, Nonlinear Regression,
 * Wiley 1989, ch. 2, recalled]). 95 % intervals are θ ± 1.96·σθ, mapped through exp for
 * log-parameters, so they are asymmetric around the fitted value.
 */
import type { DesignDocument } from '../contract/designSchema';
import { buildLoop, type LoopSpec } from '../corners/loopModel';
import { applyVariation } from '../corners/variation';
import { onePlusLoop } from '../closedloop/responses';
import { controlledStage } from '../plants/controlledStage';
import { compileTf, lnMagPhaseAt } from '../tf/evaluate';
import { isDesignInputError } from '../errors';
import { levenbergMarquardt, spdInverse, normalEquations, robustCost, type FitLoss } from './levenbergMarquardt';
import { resolveParameters, specAt, valueAt, type ResolvedParameter } from './parameters';
import { FIT_MAX_POINTS, type FitRequest, type FitResponse } from './schema';

const LN10_OVER_20 = Math.LN10 / 20;
const DEG = Math.PI / 180;
/** Two-sided 95 % quantile of the normal distribution [published: any statistics table]. */
export const Z95 = 1.959963984540054;

export interface Measurement {
	freqHz: readonly number[];
	magDb: readonly number[];
	phaseDeg: readonly number[];
}

export interface FittedParameter {
	name: ResolvedParameter['name'];
	branch: number | null;
	label: string;
	unit: string;
	path: string;
	typed: number;
	fitted: number;
	/** 95 % interval; null when the data do not determine the parameter (see `note`). */
	interval: { low: number; high: number } | null;
	/** fitted/typed − 1 (delay: null when typed is 0). */
	change: number | null;
	bounds: { low: number; high: number; from: ResolvedParameter['boundsFrom'] };
	/** The document's tolerance (fraction) and whether the fitted value lies outside typed·(1 ± tol). */
	tolerance: number | null;
	outsideTolerance: boolean;
	/** The estimate sits on a bound: the part may lie outside it, or another parameter explains the data. */
	atBound: 'low' | 'high' | null;
	note: string | null;
	/** The residual with this parameter alone put back to its typed value (the others fitted): how much of the deviation it explains. */
	residualIfTyped: ResidualSummary;
}

export interface ResidualSummary {
	/** RMS of measured − model over the fitted points, dB and degrees. */
	rmsDb: number;
	rmsDeg: number;
	/** The robust cost ½·Σρ(r²). */
	cost: number;
}

export interface FitResult {
	response: FitResponse;
	band: { startHz: number; stopHz: number; points: number };
	operatingPoint: { vin: number; iout: number };
	loss: FitLoss;
	fScale: number;
	parameters: FittedParameter[];
	residual: { before: ResidualSummary; after: ResidualSummary };
	/**
	 * Index into `parameters` of the one that explains most of the deviation: putting it back to
	 * its typed value raises the cost most, and its 95 % interval excludes the typed value. Null
	 * when no fitted parameter differs from its typed value beyond its interval, or when the fit
	 * removed less than half of the cost (the ticked values do not explain the deviation).
	 */
	explainedBy: number | null;
	/** Points whose residual exceeds 3·fScale after the fit (the loss treats them as outliers). */
	outliers: number;
	iterations: number;
	evaluations: number;
	converged: boolean;
	stop: string;
	/** The model after the fit at the fitted frequencies (dB, degrees), for an overlay. */
	fittedModel: { freqHz: number[]; magDb: number[]; phaseDeg: number[] };
	notes: string[];
}

export interface FitError {
	error: { code: 'invalid-fit'; message: string; fields: Record<string, string> };
}

export const fitError = (fields: Record<string, string>, message?: string): FitError => ({
	error: { code: 'invalid-fit', message: message ?? `The fit cannot run: ${Object.entries(fields).map(([k, v]) => `${k} ${v}`).join('; ')}.`, fields }
});

/** ln|H| and ∠H (rad) of the chosen response of a loop spec at the given frequencies. */
export function modelLogResponse(spec: LoopSpec, response: FitResponse, freqHz: readonly number[]): { lnMag: Float64Array; phase: Float64Array } {
	const n = freqHz.length;
	const lnMag = new Float64Array(n);
	const phase = new Float64Array(n);
	const buf = new Float64Array(2);
	if (response === 'output-impedance') {
		const built = buildLoop(spec);
		const zo = compileTf(built.plant.zo);
		const opl = onePlusLoop(built.loop, freqHz);
		for (let i = 0; i < n; i++) {
			lnMagPhaseAt(zo, 2 * Math.PI * freqHz[i], buf);
			lnMag[i] = buf[0] - opl.lnMag[i];
			phase[i] = buf[1] - opl.phase[i];
		}
		return { lnMag, phase };
	}
	// The plant a bench measures from the control input: Gvd in voltage mode, Gvc with the closed current loop in peak current mode.
	const tf = response === 'plant' ? controlledStage(spec.stage, spec.modulator).gvd : buildLoop(spec).loop;
	const c = compileTf(tf);
	for (let i = 0; i < n; i++) {
		lnMagPhaseAt(c, 2 * Math.PI * freqHz[i], buf);
		lnMag[i] = buf[0];
		phase[i] = buf[1];
	}
	return { lnMag, phase };
}

const reducePi = (x: number) => x - 2 * Math.PI * Math.round(x / (2 * Math.PI));

/** Indices of the measured points inside [startHz, stopHz], evenly thinned to at most `max`. */
export function fitPoints(freqHz: readonly number[], startHz: number, stopHz: number, max = FIT_MAX_POINTS): number[] {
	const inside: number[] = [];
	for (let i = 0; i < freqHz.length; i++) if (freqHz[i] >= startHz && freqHz[i] <= stopHz) inside.push(i);
	if (inside.length <= max) return inside;
	const step = (inside.length - 1) / (max - 1);
	return Array.from({ length: max }, (_, k) => inside[Math.round(k * step)]);
}

export interface FitInput {
	/** The design (validated, defaults filled) and its loop spec as analysed (loopSpecFromDetail). */
	document: DesignDocument;
	spec: LoopSpec;
	measurement: Measurement;
	request: FitRequest;
	/** What the measurement file holds when the request does not say. */
	measuredKind: FitResponse;
	/** Operating point of the measurement (absent: the design's nominal). */
	vin?: number;
	iout?: number;
}

export function fitMeasurement(input: FitInput): FitResult | FitError {
	const { document: doc, spec, measurement: m, request } = input;
	const response = request.response ?? input.measuredKind;
	const fsw = spec.stage.fswHz;
	const base = { vin: input.vin ?? spec.stage.vin, iout: input.iout ?? spec.stage.iout };
	const resolved = resolveParameters(request.parameters, spec, doc, response === 'plant');
	if (!resolved.ok) return fitError(resolved.fields);
	const params = resolved.parameters;

	const n = m.freqHz.length;
	if (n === 0 || m.magDb.length !== n || m.phaseDeg.length !== n) return fitError({ measurement: 'needs equally long frequency, gain and phase columns' });
	const startHz = request.startHz ?? m.freqHz[0];
	const stopHz = Math.min(request.stopHz ?? Infinity, fsw / 2);
	const idx = fitPoints(m.freqHz, startHz, stopHz);
	const needed = Math.max(10, 3 * params.length);
	if (idx.length < needed) {
		return fitError({ [request.startHz !== undefined || request.stopHz !== undefined ? 'startHz' : 'measurement']: `the band holds ${idx.length} measured points up to fsw/2; the fit needs at least ${needed}` });
	}
	const f = idx.map((i) => m.freqHz[i]);
	const measLn = idx.map((i) => m.magDb[i] * LN10_OVER_20);
	const measPh = idx.map((i) => m.phaseDeg[i] * DEG);
	const pts = f.length;

	// The measurement's operating point, applied once; the parameters move from there.
	let atPoint: LoopSpec;
	try {
		atPoint = applyVariation(spec, base);
		buildLoop(atPoint);
	} catch (e) {
		if (!isDesignInputError(e) && !(e instanceof RangeError)) throw e;
		return fitError({ operatingPoint: `the design cannot be modelled at Vin ${base.vin} V, Iout ${base.iout} A: ${e.message}` });
	}
	const residuals = (theta: readonly number[]): Float64Array => {
		const r = new Float64Array(2 * pts);
		let model;
		try {
			model = modelLogResponse(specAt(atPoint, params, theta), response, f);
		} catch (e) {
			if (!isDesignInputError(e) && !(e instanceof RangeError)) throw e;
			return r.fill(NaN);
		}
		for (let i = 0; i < pts; i++) {
			r[2 * i] = measLn[i] - model.lnMag[i];
			r[2 * i + 1] = reducePi(measPh[i] - model.phase[i]);
		}
		return r;
	};

	const theta0 = params.map((p) => p.start);
	let lm;
	try {
		lm = levenbergMarquardt(residuals, theta0, {
			lower: params.map((p) => p.lower),
			upper: params.map((p) => p.upper),
			loss: request.loss,
			fScale: request.fScale,
			maxIterations: request.maxIterations
		});
	} catch (e) {
		if (!(e instanceof RangeError)) throw e;
		return fitError({ measurement: e.message });
	}
	const r0 = residuals(theta0);
	const summary = (r: Float64Array): ResidualSummary => {
		let sm = 0;
		let sp = 0;
		for (let i = 0; i < pts; i++) {
			sm += (r[2 * i] / LN10_OVER_20) ** 2;
			sp += (r[2 * i + 1] / DEG) ** 2;
		}
		return { rmsDb: Math.sqrt(sm / pts), rmsDeg: Math.sqrt(sp / pts), cost: robustCost(request.loss, r, request.fScale) };
	};

	// Covariance of θ from the Jacobian at the solution (see the header).
	const p = params.length;
	const mRes = 2 * pts;
	const { a } = normalEquations(lm.jacobian, lm.residuals, lm.weights, p);
	const inv = spdInverse(a, p);
	let wss = 0;
	for (let i = 0; i < mRes; i++) wss += lm.weights[i] * lm.residuals[i] ** 2;
	const s2 = wss / Math.max(mRes - p, 1);

	// Each parameter alone back at its typed value, the others as fitted.
	const typedTheta = (q: ResolvedParameter) => (q.kind === 'delay' ? spec.modulator.delayS * fsw : 0);
	const ifTyped = params.map((q, k) => summary(residuals(lm.theta.map((t, j) => (j === k ? typedTheta(q) : t)))));

	const parameters: FittedParameter[] = params.map((q, k) => {
		const fitted = valueAt(q, lm.theta[k], fsw);
		const sigma = inv ? Math.sqrt(Math.max(inv[k * p + k] * s2, 0)) : NaN;
		const eps = 1e-9 * Math.max(1, Math.abs(q.upper - q.lower));
		const atBound = lm.theta[k] <= q.lower + eps ? 'low' : lm.theta[k] >= q.upper - eps ? 'high' : null;
		let interval: FittedParameter['interval'] = null;
		let note: string | null = null;
		if (!Number.isFinite(sigma)) note = 'not determined by this measurement: another parameter has the same effect in this band';
		else {
			interval = { low: valueAt(q, lm.theta[k] - Z95 * sigma, fsw), high: valueAt(q, lm.theta[k] + Z95 * sigma, fsw) };
			// ±1.96σ spanning more than a factor of 10 either way: the value is effectively unknown.
			if (q.kind === 'log' && Z95 * sigma > Math.LN10) note = 'poorly determined by this measurement: fix a parameter with the same effect (L with C, for instance) or widen the band';
		}
		if (atBound) note = `at the ${atBound === 'low' ? 'lower' : 'upper'} end of its search range (${q.boundsFrom === 'request' ? 'as asked' : '¼…4 × typed'}): the part may lie outside it, or another parameter explains the difference`;
		return {
			name: q.name,
			branch: q.branch,
			label: q.label,
			unit: q.unit,
			path: q.path,
			typed: q.typed,
			fitted,
			interval,
			change: q.typed > 0 ? fitted / q.typed - 1 : null,
			bounds: { low: valueAt(q, q.lower, fsw), high: valueAt(q, q.upper, fsw), from: q.boundsFrom },
			tolerance: q.tolerance,
			outsideTolerance: q.tolerance !== null && Math.abs(fitted / q.typed - 1) > q.tolerance,
			atBound,
			note,
			residualIfTyped: ifTyped[k]
		};
	});
	// Named only when the fit removed at least half of the cost: otherwise the ticked values do not
	// explain the deviation, whichever of them moved.
	const after = summary(lm.residuals);
	const before = summary(r0);
	let explainedBy: number | null = null;
	if (after.cost <= 0.5 * before.cost) {
		parameters.forEach((p, k) => {
			const excludesTyped = p.interval !== null && (p.typed < p.interval.low || p.typed > p.interval.high);
			if (excludesTyped && (explainedBy === null || ifTyped[k].cost > ifTyped[explainedBy].cost)) explainedBy = k;
		});
	}

	let outliers = 0;
	for (let i = 0; i < pts; i++) if (Math.hypot(lm.residuals[2 * i], lm.residuals[2 * i + 1]) > 3 * request.fScale) outliers++;
	const finalModel = modelLogResponse(specAt(atPoint, params, lm.theta), response, f);
	const notes: string[] = [];
	if (!lm.converged) notes.push(`stopped after ${lm.iterations} iterations before the cost settled: raise maxIterations or mark fewer parameters`);
	if (outliers > 0.2 * pts) notes.push(`${outliers} of ${pts} points stay far from the fitted model: the model may lack an element the hardware has`);
	return {
		response,
		band: { startHz: f[0], stopHz: f[pts - 1], points: pts },
		operatingPoint: base,
		loss: request.loss,
		fScale: request.fScale,
		parameters,
		residual: { before, after },
		explainedBy,
		outliers,
		iterations: lm.iterations,
		evaluations: lm.evaluations,
		converged: lm.converged,
		stop: lm.stop,
		fittedModel: {
			freqHz: f,
			magDb: Array.from(finalModel.lnMag, (x) => x / LN10_OVER_20),
			phaseDeg: Array.from(finalModel.phase, (x) => x / DEG)
		},
		notes
	};
}
