/**
 * Time responses of the linear closed-loop model: a load-current step with a linear rise
 * (v̂ = −Zo,cl·î_load, docs/formulas.md §8.1–8.2) and a reference step (v̂ = (1/H)·T/(1 + T)·v̂ref).
 * Solved exactly for the piecewise-linear input by the modal (partial-fraction) form (modal.ts);
 * when two poles nearly coincide (relative distance < 1e-6), they are split by 1e-5 relative
 * first, which changes the response by about that much. Residues are products of scaled
 * factors, so banks of up to eight ESL branches (some forty poles and zeros) stay finite. (The cascade state-space route,
 * realisation.ts + simulate.ts, is exact for well-scaled systems but measured 0.3–0.6 % off
 * scipy on banks with ESL and overflows with a 10¹¹ rad/s op-amp pole, so it is not used
 * here.) The time span follows the closed-loop
 * poles: a fine segment over the fast dynamics and, when a slow pole needs it, a coarse tail.
 */
import type { FactoredTf, Root } from '../tf/types';
import { scale } from '../tf/algebra';
import type { InputSegment, Waveform } from './simulate';
import { stepFigures, type StepFigures } from './metrics';
import { modalEdgeResponse, modalForm } from './modal';

export interface TransientOptions {
	/** Total simulated time after the step starts, s [from the closed-loop poles]. */
	durationS?: number;
	/** Steps in the fine segment [4000]; the tail (if any) gets half as many. */
	steps?: number;
	/** Settling band fraction [0.02]. */
	settleFraction?: number;
	/** Typical loop bandwidth, Hz (normally the crossover) [median closed-loop pole]. */
	bandwidthHz?: number;
}

const rootMag = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0);
/** Decay rate |Re p| of a factor's root(s), rad/s. */
const decayRate = (r: Root) => (r.kind === 'real' ? Math.abs(r.omega) : r.omega0 / (2 * Math.abs(r.q)));

/** Final value of tf's response to a unit step (its DC gain; 0 with a zero at the origin). */
export function dcGain(tf: FactoredTf): number {
	if (tf.originPower > 0) return 0;
	if (tf.originPower < 0) throw new RangeError('step response: the closed loop has a pole at the origin (no final value)');
	return tf.gain;
}

/** Time segments: ramp (if any), a fine stretch over the fast dynamics, and a coarse tail. */
export function plannedSegments(
	tf: FactoredTf,
	amplitude: number,
	riseTimeS: number,
	options: TransientOptions = {}
): { segments: InputSegment[]; u0: number; durationS: number } {
	const steps = options.steps ?? 4000;
	const rates = tf.poles.map(decayRate).filter((x) => x > 0 && Number.isFinite(x));
	const mags = tf.poles.map(rootMag).filter((x) => x > 0 && Number.isFinite(x)).sort((a, b) => a - b);
	if (!rates.length) throw new RangeError('step response: no closed-loop poles to set the time scale');
	const slowest = Math.min(...rates);
	const bandwidthOmega = options.bandwidthHz ? 2 * Math.PI * options.bandwidthHz : mags[Math.floor(mags.length / 2)];
	const total = options.durationS ?? Math.max(10 / slowest, 20 * riseTimeS, 20 / bandwidthOmega);
	const fine = Math.min(total, Math.max(60 / bandwidthOmega, 5 * riseTimeS));
	const segments: InputSegment[] = [];
	let used = 0;
	let u0 = 0;
	if (riseTimeS > 0) {
		const h = fine / steps;
		const n = Math.min(steps, Math.max(20, Math.round(riseTimeS / h)));
		segments.push({ durationS: riseTimeS, steps: n, slope: amplitude / riseTimeS });
		used = riseTimeS;
	} else u0 = amplitude;
	if (fine > used) {
		const len = fine - used;
		segments.push({ durationS: len, steps: Math.max(10, Math.round((steps * len) / fine)), slope: 0 });
		used = fine;
	}
	if (total > used * (1 + 1e-9)) segments.push({ durationS: total - used, steps: Math.max(10, Math.round(steps / 2)), slope: 0 });
	return { segments, u0, durationS: Math.max(total, used) };
}

export interface StepResult {
	waveform: Waveform;
	figures: StepFigures;
	durationS: number;
	/** How it was solved. */
	method: 'modal' | 'modal-split-poles';
}

/** Response of tf (no delay) to an input step of `amplitude` rising linearly over riseTimeS. */
export function stepResponse(
	tf: FactoredTf,
	amplitude: number,
	riseTimeS: number,
	kind: 'disturbance' | 'tracking',
	options: TransientOptions = {}
): StepResult {
	if (!(riseTimeS >= 0) || !Number.isFinite(riseTimeS)) throw new RangeError('step response: riseTime must be ≥ 0 s');
	const plan = plannedSegments(tf, amplitude, riseTimeS, options);
	let modal = modalForm(tf);
	let method: StepResult['method'] = 'modal';
	if (!(modal.minSeparation > MIN_MODAL_SEPARATION)) {
		modal = modalForm(tf, POLE_SPLIT);
		method = 'modal-split-poles';
	}
	const timeS = sampleTimes(plan.segments);
	const input = timeS.map((t) => (riseTimeS > 0 ? amplitude * Math.min(1, t / riseTimeS) : amplitude));
	const waveform: Waveform = { timeS, value: modalEdgeResponse(modal, amplitude, riseTimeS, timeS), input };
	if (plan.u0 !== 0) {
		// Ideal step: show the rest value just before t = 0.
		waveform.timeS.unshift(0);
		waveform.value.unshift(0);
		waveform.input.unshift(0);
	}
	const finalValue = dcGain(tf) * amplitude;
	for (const v of waveform.value) if (!Number.isFinite(v)) throw new RangeError('step response: non-finite output');
	const figures = stepFigures(waveform, finalValue, { kind, settleFraction: options.settleFraction });
	return { waveform, figures, durationS: plan.durationS, method };
}

/** Relative pole separation below which residues lose too many digits (then: state space). */
const MIN_MODAL_SEPARATION = 1e-6;
const POLE_SPLIT = 1e-5;

/** Instants at every step boundary of the segments, t = 0 included. */
function sampleTimes(segments: readonly InputSegment[]): number[] {
	const out = [0];
	let t0 = 0;
	for (const seg of segments) {
		const h = seg.durationS / seg.steps;
		for (let k = 1; k <= seg.steps; k++) out.push(t0 + h * k);
		t0 += seg.durationS;
	}
	return out;
}

/** Output-voltage deviation for a load-current step ΔI: v̂ = −Zo,cl·î_load. */
export function loadStepResponse(zoClosed: FactoredTf, deltaI: number, riseTimeS: number, options: TransientOptions = {}): StepResult {
	return stepResponse(scale(zoClosed, -1), deltaI, riseTimeS, 'disturbance', options);
}

/** Output response to a reference step: v̂ = (1/H)·T/(1 + T)·v̂ref (pass that transfer function). */
export function referenceStepResponse(refToOut: FactoredTf, deltaRef: number, options: TransientOptions = {}): StepResult {
	return stepResponse(refToOut, deltaRef, 0, 'tracking', options);
}

/** At most maxPoints samples for display: an even stride plus the extreme sample. */
export function decimate(w: Waveform, maxPoints = 600): { timeS: number[]; value: number[] } {
	const n = w.timeS.length;
	if (n <= maxPoints) return { timeS: [...w.timeS], value: [...w.value] };
	const stride = Math.ceil(n / maxPoints);
	let iPeak = 0;
	for (let i = 1; i < n; i++) if (Math.abs(w.value[i]) > Math.abs(w.value[iPeak])) iPeak = i;
	const keep = new Set<number>();
	for (let i = 0; i < n; i += stride) keep.add(i);
	keep.add(n - 1);
	keep.add(iPeak);
	const idx = [...keep].sort((a, b) => a - b);
	return { timeS: idx.map((i) => w.timeS[i]), value: idx.map((i) => w.value[i]) };
}
