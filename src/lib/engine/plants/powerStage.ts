/**
 * Builds the averaged small-signal model (VM) of a buck or boost at its operating point:
 * operating point, the five transfer functions and the salient features, plus warnings
 * (DCM: the CCM model does not apply [docs/formulas.md §4]; a load within 20 % of the CCM boundary).
 * A stage the document says enters DCM (diode emulation, diode rectifier) is modelled there with
 * the DCM averaged model (plants/dcmModel.ts, docs/formulas.md §4.2).
 * Formulas: docs/formulas.md §1–§4.
 */
import type { EngineWarning } from '../errors';
import { outputNetwork } from './capacitorBank';
import { operatingPoint } from './operatingPoint';
import { stageFeatures, stageTransferFunctions } from './stageModel';
import { dcmTransferFunctions } from './dcmModel';
import type { PlantModel, PowerStageInput } from './types';
import { formatEng } from '../../units/format';

/**
 * Warning code of an operating point in DCM that no model here covers: the corner is left out of
 * the margins. Only when the DCM model cannot be formed (a non-finite coefficient).
 */
export const OUTSIDE_MODEL_CODE = 'dcm-outside-model';

/** Note on an operating point in DCM analysed with the DCM averaged model. */
export const DCM_MODEL_CODE = 'dcm-averaged-model';

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
	const warnings: EngineWarning[] = [];
	const entersDcm = input.lightLoad === 'diode-emulation' || input.lightLoad === 'diode';
	const how = input.lightLoad === 'diode' ? 'a diode rectifier' : 'diode emulation';
	if (!forced && op.mode === 'dcm' && entersDcm) {
		const dcm = dcmTransferFunctions({ topology: input.topology, vin: input.vin, vout: input.vout, iout: input.iout, l: input.l, fswHz: input.fswHz }, net);
		if (Number.isFinite(dcm.duty) && Number.isFinite(dcm.gvd.gain) && Number.isFinite(dcm.zn.gain) && dcm.duty > 0 && dcm.duty < 1) {
			const { duty, ...tfs } = dcm;
			const dcmOp = { ...op, duty };
			const t = { ...tfs, network: net };
			// The boost's RHP zero moves up near fsw in DCM, out of this model's range (formulas §4.2).
			const features = { ...stageFeatures({ ...params, duty }, t), rhpZeroHz: null };
			warnings.push({
				code: DCM_MODEL_CODE,
				message: `Discontinuous conduction with ${how} (below ${formatEng(op.criticalLoadCurrent, 'A')}; this load ${formatEng(input.iout, 'A')}): analysed with the DCM averaged model, one output pole instead of the LC resonance, duty ${duty.toFixed(3)}; checked against switching simulation up to fsw/10.`
			});
			return { topology: input.topology, operatingPoint: dcmOp, features, ...t, warnings };
		}
		warnings.push({
			code: OUTSIDE_MODEL_CODE,
			message: `Outside the model: with ${how} the inductor current runs discontinuous below ${formatEng(op.criticalLoadCurrent, 'A')} (this load: ${formatEng(input.iout, 'A')}) and the DCM model cannot be formed here; this corner is left out of the margins.`
		});
	}
	const t = stageTransferFunctions(params, net);
	const features = stageFeatures(params, t);
	if (forced || (op.mode === 'dcm' && entersDcm)) {
		// Forced CCM: neither DCM nor its boundary applies. Outside the model: said above.
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

