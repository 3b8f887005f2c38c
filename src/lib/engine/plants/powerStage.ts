/**
 * Builds the averaged small-signal model (VM, CCM) of a buck or boost at its operating point:
 * operating point, the five transfer functions and the salient features, plus warnings
 * (DCM: the CCM model does not apply [docs/formulas.md §4]; a load within 20 % of the CCM boundary).
 * Formulas: docs/formulas.md §1–§4.
 */
import type { EngineWarning } from '../errors';
import { outputNetwork } from './capacitorBank';
import { operatingPoint } from './operatingPoint';
import { stageFeatures, stageTransferFunctions } from './stageModel';
import type { PlantModel, PowerStageInput } from './types';
import { formatEng } from '../../units/format';

/** Warning code of an operating point in DCM that the document says it enters (diode emulation, diode). */
export const OUTSIDE_MODEL_CODE = 'dcm-outside-model';

/** A load within 20 % of the CCM boundary is flagged [common practice: margin for L tolerance and load steps]. */
export const NEAR_BOUNDARY = 1.2;

export function powerStage(input: PowerStageInput): PlantModel {
	const net = outputNetwork(input.capacitors);
	// Forced CCM: the inductor current reverses at light load instead of stopping, so the CCM
	// averaged model holds at every load [published: E&M Ch. 5 — DCM needs a switch that blocks
	// reverse current; synchronous switches conduct both ways].
	const forced = input.lightLoad === 'forced-ccm';
	const computed = operatingPoint(input, net.branches);
	const op = forced ? { ...computed, mode: 'ccm' as const } : computed;
	const params = {
		topology: input.topology,
		vin: input.vin,
		vout: input.vout,
		duty: op.duty,
		rLoad: op.rLoad,
		rSeries: op.rSeries,
		l: input.l,
		inductorCurrent: op.inductorCurrent
	};
	const t = stageTransferFunctions(params, net);
	const features = stageFeatures(params, t);
	const warnings: EngineWarning[] = [];
	const entersDcm = input.lightLoad === 'diode-emulation' || input.lightLoad === 'diode';
	if (forced) {
		// Neither DCM nor its boundary applies.
	} else if (op.mode === 'dcm' && entersDcm) {
		warnings.push({
			code: OUTSIDE_MODEL_CODE,
			message: `Outside the model: with ${input.lightLoad === 'diode' ? 'a diode rectifier' : 'diode emulation'} the inductor current runs discontinuous below ${formatEng(op.criticalLoadCurrent, 'A')} (this load: ${formatEng(input.iout, 'A')}), where the CCM averaged model does not apply; this corner is left out of the margins.`
		});
	} else if (op.mode === 'dcm') {
		warnings.push({
			code: 'dcm-operating-point',
			message: `The inductor current runs discontinuous (L = ${formatEng(input.l, 'H')} is below the critical ${formatEng(op.criticalInductance, 'H')}, or the load current is below ${formatEng(op.criticalLoadCurrent, 'A')}); the CCM averaged model does not apply.`
		});
	} else if (input.iout < NEAR_BOUNDARY * op.criticalLoadCurrent) {
		warnings.push({
			code: 'near-ccm-boundary',
			message: `The load (${formatEng(input.iout, 'A')}) is within ${Math.round((NEAR_BOUNDARY - 1) * 100)} % of the CCM boundary (${formatEng(op.criticalLoadCurrent, 'A')}): a little less load or inductance and the inductor current runs discontinuous, where the CCM averaged model does not apply.`
		});
	}
	const halfFsw = input.fswHz / 2;
	if (features.f0Hz > halfFsw) {
		warnings.push({
			code: 'resonance-above-fsw-half',
			message: `The LC resonance (${formatEng(features.f0Hz, 'Hz')}) sits above fsw/2; the averaged model is not trusted there.`
		});
	}
	if (features.rhpZeroHz !== null && features.rhpZeroHz > 0 && features.rhpZeroHz < features.f0Hz) {
		warnings.push({
			code: 'rhp-zero-below-resonance',
			message: `The RHP zero (${formatEng(features.rhpZeroHz, 'Hz')}) sits below the LC resonance; the usable crossover is very low.`
		});
	}
	return { topology: input.topology, operatingPoint: op, features, ...t, warnings };
}

