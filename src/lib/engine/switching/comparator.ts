/**
 * The PWM comparator of the switching model, one form for both control methods: the switch,
 * turned on by the clock, stays on while the margin g(x, τ) = c·x − S·τ is positive (τ the time
 * since the clock edge) and turns off where it reaches zero, or at the maximum duty
 * (docs/formulas.md §13.2):
 *   voltage mode        c·x = vc,            S = Vramp/Ts  (vc falls to a 0 → Vramp ramp)
 *   peak current mode   c·x = vc − Ri·iL,    S = Se        (Ri·iL + Se·τ rises to vc)
 * Keeping the form shared lets the turn-off search, the saltation matrix of the cycle's Jacobian
 * (c and S enter it as they stand) and the shooting serve both methods unchanged.
 */
import type { SwitchingCircuitInput } from './circuit';

/** Peak current mode's parameters at the comparator (the design document's modulator, §14.1). */
export interface CurrentModeCircuit {
	/** Ri: sensed voltage per ampere of inductor current, V/A. */
	senseGain: number;
	/** Se: slope of the compensation ramp, V/s (0 allowed). */
	rampSlope: number;
	/** The clock turns the switch off at this fraction of the period if the comparator has not (1: never). */
	maxDuty?: number;
}

export interface ComparatorSpec {
	control: 'voltage' | 'peak-current';
	/** S, V/s: the margin falls by S per second of on time besides the circuit's own motion. */
	rampSlope: number;
	/** Fraction of the period after which the clock ends the on interval (1: never). */
	maxDuty: number;
	/** Size of the margin's swing over a period, V (the scale of the root finder's tolerance). */
	scale: number;
}

/** Margin row over the augmented state and the comparator's ramp, from the amplifier-output row. */
export function comparatorOf(c: SwitchingCircuitInput, amplifier: Float64Array, iLIndex: number): { control: Float64Array; spec: ComparatorSpec } {
	const ts = 1 / c.fswHz;
	const cm = c.currentMode;
	if (!cm) {
		return { control: amplifier, spec: { control: 'voltage', rampSlope: c.vramp / ts, maxDuty: 1, scale: c.vramp } };
	}
	const control = Float64Array.from(amplifier);
	control[iLIndex] -= cm.senseGain;
	// The sensed current rises at most Ri·Vin/L (boost: exactly; buck: Ri·(Vin − Vout)/L).
	const scale = cm.senseGain * (c.vin / c.l) * ts + cm.rampSlope * ts;
	const maxDuty = Math.min(Math.max(cm.maxDuty ?? 1, 0), 1);
	return { control, spec: { control: 'peak-current', rampSlope: cm.rampSlope, maxDuty, scale } };
}
