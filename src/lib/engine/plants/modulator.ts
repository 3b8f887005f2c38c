/**
 * PWM modulator gain Fm = 1/VM, VM = peak-to-peak ramp [published: E&M §7.6; from memory].
 * With input feed-forward the ramp scales with vin: VM = vramp·vin/vinNominal (docs/formulas.md §3).
 * A loop delay Td multiplies the loop by e^(−s·Td), evaluated exactly.
 * Peak current mode: the comparator's gain lives in the plant (plants/currentMode.ts, whose
 * response starts at the control voltage), so the modulator here is 1 with the delay.
 */
import type { FactoredTf } from '../tf/types';
import type { CurrentModeInput } from './currentMode';

export interface ModulatorInput {
	/** Peak-to-peak ramp at the nominal input voltage, V. */
	vramp: number;
	feedForward: boolean;
	/** Pure loop delay, s. */
	delayS: number;
	/** Present for peak current-mode control (then vramp and feedForward are not used). */
	currentMode?: CurrentModeInput;
}

export function rampAmplitude(m: ModulatorInput, vin: number, vinNominal = vin): number {
	return m.feedForward ? (m.vramp * vin) / vinNominal : m.vramp;
}

/** Fm·e^(−s·Td) as a transfer function. */
export function modulatorTf(m: ModulatorInput, vin: number, vinNominal = vin): FactoredTf {
	const gain = m.currentMode ? 1 : 1 / rampAmplitude(m, vin, vinNominal);
	const tf: FactoredTf = { gain, originPower: 0, zeros: [], poles: [] };
	if (m.delayS > 0) tf.delayS = m.delayS;
	return tf;
}
