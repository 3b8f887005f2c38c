/**
 * Types shared by the averaged power-stage models (voltage mode, CCM). SI units throughout;
 * names follow docs/formulas.md §0: R = vout/iout load, r = dcr + rdsOn series resistance.
 */
import type { EngineWarning } from '../errors';
import type { FactoredTf } from '../tf/types';

/** `count` identical parts in parallel, each C with series ESR and ESL (0 when unknown). */
export interface CapacitorBranch {
	c: number;
	esr: number;
	esl: number;
	count: number;
}

export interface PowerStageInput {
	topology: 'buck' | 'boost';
	vin: number;
	vout: number;
	iout: number;
	fswHz: number;
	l: number;
	dcr: number;
	/** Switch on-resistance, lumped with dcr (synchronous switches of equal resistance). */
	rdsOn: number;
	capacitors: CapacitorBranch[];
	/**
	 * Light-load behaviour: 'forced-ccm' keeps the CCM model at any load; 'diode-emulation' and
	 * 'diode' enter DCM below the boundary (outside the model). Absent: DCM is only warned about.
	 */
	lightLoad?: 'forced-ccm' | 'diode-emulation' | 'diode';
}

export interface OperatingPoint {
	duty: number;
	/** Conduction efficiency from the series resistance r alone. */
	efficiency: number;
	/** Load resistance vout/iout, Ω. */
	rLoad: number;
	/** Series resistance r = dcr + rdsOn, Ω. */
	rSeries: number;
	/** Average inductor current, A. */
	inductorCurrent: number;
	/** Inductor peak-to-peak ripple current, A. */
	rippleCurrent: number;
	/** Output ripple peak-to-peak: capacitive part, ESR part and their sum (an upper bound). */
	outputRipple: { capacitive: number; esr: number; total: number };
	mode: 'ccm' | 'dcm';
	/** CCM holds for L > criticalInductance. */
	criticalInductance: number;
	/** CCM holds for a load resistance below criticalLoadResistance (current above criticalLoadCurrent). */
	criticalLoadResistance: number;
	criticalLoadCurrent: number;
}

export interface PlantFeatures {
	/** Dominant (lowest) resonance of the control-to-output poles, Hz. */
	f0Hz: number;
	q: number;
	/** One ESR zero per capacitor branch with ESR > 0, ascending, Hz. */
	esrZeroHz: number[];
	/** Series self-resonance of each branch with ESL > 0, ascending, Hz. */
	selfResonanceHz: number[];
	/** Boost RHP zero (D'²R − r)/(2πL); null for the buck. */
	rhpZeroHz: number | null;
}

/** Averaged small-signal model of one power stage at its operating point. */
export interface PlantModel {
	topology: 'buck' | 'boost';
	operatingPoint: OperatingPoint;
	features: PlantFeatures;
	/** Control (duty) to output. */
	gvd: FactoredTf;
	/** Line to output. */
	gvg: FactoredTf;
	/** Open-loop output impedance (current injected into the output node), Ω. */
	zo: FactoredTf;
	/** Input impedance with d̂ = 0, Ω. */
	zd: FactoredTf;
	/** Input impedance with the output nulled by ideal feedback, Ω (negative). */
	zn: FactoredTf;
	warnings: EngineWarning[];
}
