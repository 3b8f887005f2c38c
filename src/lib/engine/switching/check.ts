/**
 * The switching check of a design: the periodic orbit and its multipliers, the loop gain measured
 * on the switching model at about ten frequencies, its crossover and phase margin beside the
 * averaged model's, and a caution when they part by more than the stated tolerance
 * (docs/formulas.md §13.5). Voltage mode and peak current mode (comparator.ts), CCM with
 * synchronous switches; a delay is not modelled.
 */
import { evaluate, evaluatePolar } from '../tf/evaluate';
import type { FactoredTf } from '../tf/types';
import { formatEng } from '../../units/format';
import { switchedSystem, type SwitchingCircuitInput } from './circuit';
import { Propagator } from './cycle';
import { matVec } from './linalg';
import { measureLoopGain, periodsFor, type LoopGainPoint } from './measure';
import { periodicSteadyState, readMultipliers, type MultiplierReading, type PeriodicOrbit } from './steadyState';

/** The switching model and the averaged one agree when PM is within this many degrees … */
export const PM_TOLERANCE_DEG = 3;
/** … and fc within this fraction. */
export const FC_TOLERANCE = 0.1;
/** Default injection: the duty cycle moves by this much peak (averaged-model estimate). */
export const DEFAULT_DUTY_MODULATION = 1e-3;
/** Points the crossover search may add beside the switching crossover (two passes of two). */
const CROSSOVER_EXTRA_POINTS = 4;
/**
 * The most switching periods one measured point may take: its frequency is fsw/N with N at most
 * this. A point costs N periods per chord iteration (about a second per thousand periods on one
 * core), so a design crossing over at tens of hertz would otherwise ask for hundreds of thousands
 * of periods, minutes of CPU in the browser or the analysis pool. The API's frequencies keep the
 * same bound (fsw/2000).
 */
export const MAX_PERIODS_PER_POINT = 2000;

export interface SwitchingCheckInput {
	circuit: SwitchingCircuitInput;
	/** Averaged loop T and compensator Gc (for the injection amplitude and the phase branch). */
	averagedLoop: FactoredTf;
	averagedCompensator: FactoredTf;
	averaged: { crossoverHz: number | null; phaseMarginDeg: number | null };
	/** Averaged operating point: duty, inductor current and output voltage (the shooting's first guess). */
	duty: number;
	inductorCurrent: number;
	vout: number;
	delayS: number;
	/** Why the design is outside the switching model's reach (peak current mode, a DCM nominal point), or null. */
	outsideReach: string | null;
}

export interface SwitchingCheckOptions {
	/** Frequencies to measure, Hz [a decade each side of fc and fsw/10 … fsw/3]. */
	freqHz?: readonly number[];
	dutyModulation?: number;
	/** Called after each measurement, with the count done and the total planned. */
	onProgress?: (done: number, total: number) => void;
}

export interface SwitchingPoint extends LoopGainPoint {
	/** The measured phase on the averaged model's 360° branch. */
	phaseUnwrappedDeg: number;
	averagedMagDb: number;
	averagedPhaseDeg: number;
}

export interface SwitchingCheckResult {
	status: 'agrees' | 'differs' | 'not-run';
	reason: string | null;
	orbit: {
		duty: number;
		valleyCurrent: number;
		peakCurrent: number;
		multipliers: { re: number; im: number }[];
		spectralRadius: number;
		reading: MultiplierReading;
		words: string;
		/** Slope of the control voltage at the turn-off instant over the slope it meets (the ramp; in peak current mode the sensed current plus the ramp). */
		controlSlopeRatio: number;
	} | null;
	points: SwitchingPoint[];
	switching: { crossoverHz: number | null; phaseMarginDeg: number | null };
	averaged: { crossoverHz: number | null; phaseMarginDeg: number | null };
	tolerance: { phaseMarginDeg: number; crossoverFraction: number };
	/** T at the point nearest fc measured again at half the amplitude. */
	linearity: { freqHz: number; deltaDb: number; deltaDeg: number } | null;
	caution: string | null;
	notes: string[];
}

const notRun = (input: SwitchingCheckInput, reason: string): SwitchingCheckResult => ({
	status: 'not-run',
	reason,
	orbit: null,
	points: [],
	switching: { crossoverHz: null, phaseMarginDeg: null },
	averaged: input.averaged,
	tolerance: { phaseMarginDeg: PM_TOLERANCE_DEG, crossoverFraction: FC_TOLERANCE },
	linearity: null,
	caution: null,
	notes: []
});

/** Peak current mode's control voltage at the averaged point: Ri·(IL + ΔiL/2) + Se·D·Ts. */
function peakControlGuess(input: SwitchingCheckInput): number {
	const c = input.circuit;
	const cm = c.currentMode!;
	const onTime = input.duty / c.fswHz;
	const rise = c.topology === 'buck' ? c.vin - input.vout : c.vin;
	return cm.senseGain * (input.inductorCurrent + (rise * onTime) / (2 * c.l)) + cm.rampSlope * onTime;
}

/** First guess of the orbit: the averaged operating point, the network at its DC state. */
export function initialGuess(input: SwitchingCheckInput, names: string[], n: number): Float64Array {
	const c = input.circuit;
	const x = new Float64Array(n);
	const vo = c.currentMode ? peakControlGuess(input) : input.duty * c.vramp;
	const a0 = c.opamp && c.network.kind !== 'type2-ota' ? 10 ** (c.opamp.a0Db / 20) : Infinity;
	const vMinus = c.vref - vo / a0;
	const ota = c.network.kind === 'type2-ota';
	names.forEach((name, i) => {
		if (name === 'iL') x[i] = input.inductorCurrent;
		else if (name.startsWith('vBank')) x[i] = input.vout;
		else if (name === 'vF' || (name === 'vC1' && !ota)) x[i] = vMinus - vo; // no DC current in R2
		else if (name === 'vC3') x[i] = input.vout - vMinus;
		else if (name === 'vo' || (name === 'vC1' && ota)) x[i] = vo;
	});
	x[n - 3] = 1;
	x[n - 1] = 1;
	return x;
}

export function orbitOf(input: SwitchingCheckInput): { orbit: PeriodicOrbit; prop: Propagator } {
	const sys = switchedSystem(input.circuit, { omega: 0, amplitude: 0 });
	const prop = new Propagator(sys, input.circuit.fswHz);
	const orbit = periodicSteadyState(prop, initialGuess(input, sys.names, sys.n));
	return { orbit, prop };
}

/**
 * The default frequencies: fc × {0.1, 0.2, 0.5, 2, 5, 10} and fsw/10, fsw/5, fsw/3, none above
 * fsw/3 (at fsw/2 the modulator's sampling dominates and no averaged figure is comparable) and
 * none below fsw/MAX_PERIODS_PER_POINT.
 */
export function defaultCheckFrequencies(fcHz: number | null, fswHz: number): number[] {
	const fc = fcHz ?? fswHz / 20;
	const list = [0.1, 0.2, 0.5, 2, 5, 10].map((k) => k * fc).concat([fswHz / 10, fswHz / 5, fswHz / 3]);
	return list.filter((f) => f > 0 && f <= (fswHz / 3) * (1 + 1e-9) && withinPeriodLimit(fswHz, f));
}

const withinPeriodLimit = (fswHz: number, freqHz: number) => periodsFor(fswHz, freqHz) <= MAX_PERIODS_PER_POINT;

/** Why a check would need more periods per point than MAX_PERIODS_PER_POINT, or null. */
function periodLimitReason(input: SwitchingCheckInput, freqHz: readonly number[] | undefined): string | null {
	const fsw = input.circuit.fswHz;
	const limit = `fsw/${MAX_PERIODS_PER_POINT} (${formatEng(fsw / MAX_PERIODS_PER_POINT, 'Hz')}), the lowest frequency the switching check measures (at most ${MAX_PERIODS_PER_POINT} switching periods per point)`;
	if (freqHz) {
		const low = freqHz.find((f) => !withinPeriodLimit(fsw, f));
		return low === undefined ? null : `The frequency ${formatEng(low, 'Hz')} is below ${limit}.`;
	}
	const fc = input.averaged.crossoverHz;
	// The points beside the crossover are fsw/N with N around fsw/fc: that ratio must stay within the limit.
	if (fc === null || fsw / fc <= MAX_PERIODS_PER_POINT) return null;
	return `The crossover (${formatEng(fc, 'Hz')}) is below ${limit}: measuring the loop there would take ${Math.round(fsw / fc)} periods per point.`;
}

export function switchingCheck(input: SwitchingCheckInput, options: SwitchingCheckOptions = {}): SwitchingCheckResult {
	const c = input.circuit;
	if (input.outsideReach) return notRun(input, input.outsideReach);
	if (input.delayS > 0) return notRun(input, `The loop delay (${formatEng(input.delayS, 's')}) is not in the switching model.`);
	const tooSlow = periodLimitReason(input, options.freqHz);
	if (tooSlow) return notRun(input, tooSlow);
	let found: ReturnType<typeof orbitOf>;
	try {
		found = orbitOf(input);
	} catch (error) {
		// A singular Newton step or an eigenvalue iteration that does not settle: said, never thrown.
		return notRun(input, `The switching model could not be solved for this design (${error instanceof Error ? error.message : String(error)}).`);
	}
	const { orbit, prop } = found;
	if (!orbit.converged) return notRun(input, 'The switching model found no periodic steady state (the shooting did not converge).');
	// A fixed point with the switch off (or on) for whole periods is no regulating orbit: the shooting
	// left the region where the comparator trips (a control gain far outside practice, e.g. a tiny Ri).
	if (orbit.cycle.tOff <= 0 || orbit.cycle.tOff >= prop.ts) {
		return notRun(input, `The switching model found no regulating steady state: the switch stays ${orbit.cycle.tOff <= 0 ? 'off' : 'on'} for whole periods.`);
	}
	const reading = readMultipliers(orbit.multipliers);
	const slopes = comparatorSlopes(prop, orbit);
	const orbitReport = {
		duty: orbit.duty,
		valleyCurrent: orbit.valleyCurrent,
		peakCurrent: orbit.cycle.xOff[prop.sys.iL],
		multipliers: orbit.multipliers.map((z) => ({ re: z.re, im: z.im })),
		spectralRadius: orbit.spectralRadius,
		reading,
		words: multiplierWords(reading, orbit.spectralRadius, c.fswHz),
		controlSlopeRatio: slopes.ratio
	};
	const notes: string[] = [];
	if (orbit.valleyCurrent < 0) {
		notes.push(
			`The inductor current reverses each period (valley ${formatEng(orbit.valleyCurrent, 'A')}): modelled with synchronous switches; a diode or diode emulation would run discontinuous, which this check does not model.`
		);
	}
	if (reading !== 'stable') {
		return { ...notRun(input, orbitReport.words), orbit: orbitReport };
	}

	const requested = options.freqHz ?? defaultCheckFrequencies(input.averaged.crossoverHz, c.fswHz);
	if (!options.freqHz && input.averaged.crossoverHz !== null && !withinPeriodLimit(c.fswHz, input.averaged.crossoverHz / 10)) {
		notes.push(`Points below fsw/${MAX_PERIODS_PER_POINT} (${formatEng(c.fswHz / MAX_PERIODS_PER_POINT, 'Hz')}) are left out: each would take more than ${MAX_PERIODS_PER_POINT} switching periods.`);
	}
	const periodsWanted = [...new Set(requested.map((f) => periodsFor(c.fswHz, f)))];
	const fcAvg = input.averaged.crossoverHz;
	if (!options.freqHz && fcAvg !== null && fcAvg < c.fswHz / 3) {
		const nc = c.fswHz / fcAvg;
		for (const p of [Math.max(3, Math.floor(nc)), Math.max(3, Math.ceil(nc))]) if (!periodsWanted.includes(p)) periodsWanted.push(p);
	}
	// Planned: every requested point, the points the crossover search may add beside the switching
	// crossover (two passes of two at most) and the linearity repeat. The reserve is released once
	// the search ends, so done/total never moves backwards and reaches 1 only at the end.
	let total = periodsWanted.length + CROSSOVER_EXTRA_POINTS + 1;
	const modulation = options.dutyModulation ?? DEFAULT_DUTY_MODULATION;
	const ctx = { circuit: c, orbit };
	const amplitudeAt = (freqHz: number) => {
		const omega = 2 * Math.PI * freqHz;
		const t = evaluate(input.averagedLoop, omega);
		const gc = evaluate(input.averagedCompensator, omega);
		const onePlusT = Math.hypot(1 + t.re, t.im);
		return (modulation * slopes.rampEquivalent * onePlusT) / Math.max(Math.hypot(gc.re, gc.im), 1e-12);
	};
	const points: SwitchingPoint[] = [];
	let done = 0;
	for (const p of periodsWanted.sort((a, b) => b - a)) {
		const f = c.fswHz / p;
		points.push(withAveraged(measureLoopGain(ctx, p, amplitudeAt(f)), input.averagedLoop));
		options.onProgress?.(++done, total);
	}
	let switching = crossoverOf(points);
	// Where the switching crossover lies between points far apart, measure beside it too.
	for (let pass = 0; pass < 2 && switching.crossoverHz !== null; pass++) {
		const nc = c.fswHz / switching.crossoverHz;
		const wanted = [Math.max(3, Math.floor(nc)), Math.max(3, Math.ceil(nc))].filter((p) => !points.some((q) => q.periods === p));
		if (!wanted.length) break;
		for (const p of wanted) {
			points.push(withAveraged(measureLoopGain(ctx, p, amplitudeAt(c.fswHz / p)), input.averagedLoop));
			options.onProgress?.(++done, total);
		}
		switching = crossoverOf(points);
	}
	total = done + 1;
	// Linearity: the point nearest the crossover again at half the amplitude.
	let linearity: SwitchingCheckResult['linearity'] = null;
	const near = nearest(points, switching.crossoverHz ?? fcAvg ?? c.fswHz / 10);
	if (near) {
		const half = measureLoopGain(ctx, near.periods, near.amplitude / 2);
		linearity = { freqHz: near.freqHz, deltaDb: half.magDb - near.magDb, deltaDeg: wrap180(half.phaseDeg - near.phaseDeg) };
	}
	options.onProgress?.(total, total);

	let caution: string | null = null;
	const dPm = switching.phaseMarginDeg !== null && input.averaged.phaseMarginDeg !== null ? switching.phaseMarginDeg - input.averaged.phaseMarginDeg : null;
	const fcRatio = switching.crossoverHz !== null && fcAvg !== null ? switching.crossoverHz / fcAvg : null;
	const pmOff = dPm !== null && Math.abs(dPm) > PM_TOLERANCE_DEG;
	const fcOff = fcRatio !== null && Math.abs(fcRatio - 1) > FC_TOLERANCE;
	const missing = (switching.crossoverHz === null) !== (fcAvg === null);
	if (pmOff || fcOff || missing) {
		caution = cautionWords(input, switching, orbitReport.controlSlopeRatio, dPm, fcRatio);
	}
	return {
		status: caution ? 'differs' : 'agrees',
		reason: null,
		orbit: orbitReport,
		points: points.sort((a, b) => a.freqHz - b.freqHz),
		switching,
		averaged: input.averaged,
		tolerance: { phaseMarginDeg: PM_TOLERANCE_DEG, crossoverFraction: FC_TOLERANCE },
		linearity,
		caution,
		notes
	};
}

/**
 * At the orbit's turn-off instant: the control voltage's slope over the slope of what it meets
 * (the ramp in voltage mode; Sn + Se, the sensed current's rise plus the ramp, in peak current
 * mode), and the peak-to-peak ramp that gives the modulator's averaged gain (Vramp; (Sn + Se)·Ts,
 * docs/formulas.md §14.1), from which the injection amplitude is set.
 */
function comparatorSlopes(prop: Propagator, orbit: PeriodicOrbit): { ratio: number; rampEquivalent: number } {
	const { sys, ts } = prop;
	const xOff = orbit.cycle.xOff;
	const fx = matVec(sys.aOn, xOff, sys.n);
	const vcRate = sys.amplifier.reduce((s, v, i) => s + v * fx[i], 0);
	if (sys.comparator.control === 'voltage') return { ratio: vcRate / prop.slope, rampEquivalent: prop.slope * ts };
	// What vc meets rises at Ri·diL/dt + Se = vcRate − (margin's rate); Sn is taken from the orbit's
	// own rise, valley to peak over the on time, as the averaged model takes it from the ripple.
	const met = vcRate - prop.marginRate(xOff);
	const senseGain = sys.amplifier[sys.iL] - sys.control[sys.iL];
	const tOn = orbit.cycle.tOff;
	const sn = tOn > 0 ? (senseGain * (xOff[sys.iL] - orbit.x0[sys.iL])) / tOn : 0;
	const rampEquivalent = (sn + prop.slope) * ts;
	return { ratio: met > 0 ? vcRate / met : 0, rampEquivalent: rampEquivalent > 0 ? rampEquivalent : sys.comparator.scale };
}

function withAveraged(p: LoopGainPoint, loop: FactoredTf): SwitchingPoint {
	// The averaged model's unwrapped phase (factored evaluation, §7.6) picks the 360° branch.
	const avg = evaluatePolar(loop, 2 * Math.PI * p.freqHz);
	const k = Math.round((avg.phaseDeg - p.phaseDeg) / 360);
	return { ...p, phaseUnwrappedDeg: p.phaseDeg + 360 * k, averagedMagDb: avg.magDb, averagedPhaseDeg: avg.phaseDeg };
}

const wrap180 = (deg: number) => deg - 360 * Math.round(deg / 360);

function nearest(points: readonly SwitchingPoint[], freqHz: number): SwitchingPoint | null {
	let best: SwitchingPoint | null = null;
	for (const p of points) if (!best || Math.abs(Math.log(p.freqHz / freqHz)) < Math.abs(Math.log(best.freqHz / freqHz))) best = p;
	return best;
}

/** The first downward 0 dB crossing of the measured points, interpolated in log f. */
export function crossoverOf(points: readonly SwitchingPoint[]): { crossoverHz: number | null; phaseMarginDeg: number | null } {
	const sorted = [...points].sort((a, b) => a.freqHz - b.freqHz);
	for (let i = 0; i + 1 < sorted.length; i++) {
		const a = sorted[i];
		const b = sorted[i + 1];
		if (a.magDb > 0 && b.magDb <= 0) {
			const u = a.magDb / (a.magDb - b.magDb);
			const lf = Math.log(a.freqHz) + u * (Math.log(b.freqHz) - Math.log(a.freqHz));
			const phase = a.phaseUnwrappedDeg + u * (b.phaseUnwrappedDeg - a.phaseUnwrappedDeg);
			return { crossoverHz: Math.exp(lf), phaseMarginDeg: wrap180(180 + phase) };
		}
	}
	return { crossoverHz: null, phaseMarginDeg: null };
}

function multiplierWords(reading: MultiplierReading, radius: number, fswHz: number): string {
	switch (reading) {
		case 'period-two':
			return 'The switching alternates from one period to the next (period two, a subharmonic at fsw/2): the averaged model cannot show this.';
		case 'unstable':
			return `The periodic operation is unstable from cycle to cycle (largest multiplier ${radius.toFixed(3)}).`;
		case 'near-period-two':
			return 'Stable, but close to alternating from one period to the next (a multiplier near −1): expect ringing at fsw/2.';
		default: {
			const cycles = radius > 0 ? Math.log(0.5) / Math.log(radius) : 0;
			return `Stable from cycle to cycle: a disturbance halves in about ${Math.max(1, Math.round(cycles))} switching periods (${formatEng(Math.max(1, cycles) / fswHz, 's')}).`;
		}
	}
}

function cautionWords(
	input: SwitchingCheckInput,
	sw: { crossoverHz: number | null; phaseMarginDeg: number | null },
	slopeRatio: number,
	dPm: number | null,
	fcRatio: number | null
): string {
	const parts: string[] = [];
	if (dPm !== null) parts.push(`phase margin ${sw.phaseMarginDeg!.toFixed(1)}° against ${input.averaged.phaseMarginDeg!.toFixed(1)}° averaged`);
	if (fcRatio !== null) parts.push(`crossover ${formatEng(sw.crossoverHz!, 'Hz')} against ${formatEng(input.averaged.crossoverHz!, 'Hz')}`);
	if (sw.crossoverHz === null && input.averaged.crossoverHz !== null) parts.push('no crossover found at the measured frequencies');
	const causes: string[] = [];
	if (Math.abs(slopeRatio) > 0.02) {
		causes.push(
			input.circuit.currentMode
				? `output ripple reaches the comparator through the network's high-frequency gain: at the turn-off instant the control voltage moves at ${Math.round(slopeRatio * 100)} % of the slope of the sensed current plus the ramp, so the modulator's gain is not 1/((Sn + Se)·Ts)`
				: `output ripple reaches the comparator through the network's high-frequency gain: at the turn-off instant the control voltage moves at ${Math.round(slopeRatio * 100)} % of the ramp's slope, so the modulator's gain is not 1/Vramp`
		);
	}
	causes.push('a light load, where the ripple is large against the DC current');
	if ((input.averaged.crossoverHz ?? 0) > input.circuit.fswHz / 10) causes.push('a crossover near fsw/2, where the modulator samples the control voltage once per period');
	return `The switching model differs from the averaged one (${parts.join('; ')}; tolerance ${PM_TOLERANCE_DEG}° and ${Math.round(FC_TOLERANCE * 100)} % in fc). Usual causes: ${causes.join('; ')}.`;
}
