/**
 * The analysed design mapped to the switching model's circuit (switching/circuit.ts): the same
 * effective capacitor branches, series resistance and load as the averaged plant, the compensator
 * parts that were built (rounded when a series is set) and the document's op-amp model.
 */
import { analyzeDesignDetailed, type AnalysisDetail } from '../analyze';
import type { ContractError } from '../contract/errors';
import type { SwitchingCircuitInput } from '../switching/circuit';
import { switchingCheck, type SwitchingCheckInput, type SwitchingCheckOptions, type SwitchingCheckResult } from '../switching/check';
import type { NetworkParts } from '../synthesis/networks';
import { switchingLoadStep, type SwitchingLoadStep } from '../switching/loadStep';
import { rampAmplitude } from '../plants/modulator';
import { modulatorInputOf, stageInputOf } from './documentModel';
import { outputNetwork } from '../plants/capacitorBank';

export function switchingCircuitOf(detail: AnalysisDetail): SwitchingCircuitInput {
	const d = detail.document;
	const op = detail.plant.operatingPoint;
	const report = detail.compensator.rounded ?? detail.compensator.ideal;
	const parts = report.parts;
	const network = {
		kind: detail.compensator.kind,
		...parts,
		rb: parts.rb ?? null,
		...(detail.compensator.kind === 'type2-ota' ? { ro: parts.ro ?? null } : {})
	} as unknown as NetworkParts;
	return {
		topology: d.plant.topology,
		vin: d.plant.vin,
		rSeries: op.rSeries,
		l: d.plant.inductor.l,
		rLoad: op.rLoad,
		branches: outputNetwork(stageInputOf(d).capacitors).branches,
		network,
		opamp: d.compensator.kind === 'type2-ota' ? null : (d.compensator.opamp ?? null),
		vref: d.feedback.vref,
		vramp: rampAmplitude(modulatorInputOf(d), d.plant.vin),
		fswHz: d.plant.fsw,
		// The document names no maximum duty (neither does the averaged model): the clock never ends the on interval.
		currentMode: d.modulator.control === 'peak-current' ? { senseGain: d.modulator.senseGain ?? 0, rampSlope: d.modulator.rampSlope ?? 0 } : null
	};
}

/** The switching check's input for an analysed design (averaged figures from its built loop). */
export function switchingCheckInputOf(detail: AnalysisDetail): SwitchingCheckInput {
	const op = detail.plant.operatingPoint;
	return {
		circuit: switchingCircuitOf(detail),
		averagedLoop: detail.loop,
		averagedCompensator: detail.compensator.built,
		averaged: { crossoverHz: detail.metrics.crossoverHz, phaseMarginDeg: detail.metrics.phaseMarginDeg },
		duty: op.duty,
		inductorCurrent: op.inductorCurrent,
		vout: detail.document.plant.vout,
		delayS: detail.document.modulator.delay,
		outsideReach: outsideReachOf(detail)
	};
}

/**
 * The switching check of a design document (any JSON value): the averaged analysis first (its
 * built network, its margins), then the switching model; a document the engine refuses comes
 * back as the contract error.
 */
export function switchingCheckOfDesign(doc: unknown, options: SwitchingCheckOptions = {}): SwitchingCheckResult | ContractError {
	const detail = analyzeDesignDetailed(doc, { includeResponse: false, closedLoop: false, sections: false });
	if ('error' in detail) return detail;
	return switchingCheck(switchingCheckInputOf(detail), options);
}

/** The load step on the switching model beside the averaged one, for the same step and duration. */
export interface SwitchingStepComparison {
	/** The averaged model's deviation (closed loop, −Zo,cl·ΔI with the document's edge), decimated. */
	averaged: { timeS: number[]; value: number[]; riseTimeS: number };
	/** The switched circuit's deviation at every clock edge, or why there is none. */
	switching: SwitchingLoadStep | { reason: string };
	/** True when the switched run stopped at MAX_SWITCHED_STEP_PERIODS before the averaged duration. */
	truncated: boolean;
}

/** The switched run of a step covers at most this many periods (about a second of CPU). */
export const MAX_SWITCHED_STEP_PERIODS = 1000;

/**
 * The document's load step (loadStep.step, default half the load; the averaged duration) on the
 * averaged model and on the switched circuit, started from its periodic steady state.
 */
export function switchingLoadStepOfDesign(doc: unknown): SwitchingStepComparison | ContractError | { reason: string } {
	const detail = analyzeDesignDetailed(doc, { includeResponse: false, closedLoop: true, sections: false });
	if ('error' in detail) return detail;
	const ls = detail.response.closedLoop?.loadStep;
	if (!ls) return { reason: 'The averaged model has no load step for this design (an unstable closed loop has none).' };
	const input = switchingCheckInputOf(detail);
	const reach = input.outsideReach ?? (input.delayS > 0 ? 'The loop delay is not in the switching model.' : null);
	const periods = Math.ceil(ls.durationS * input.circuit.fswHz);
	const truncated = periods > MAX_SWITCHED_STEP_PERIODS;
	const durationS = Math.min(ls.durationS, MAX_SWITCHED_STEP_PERIODS / input.circuit.fswHz);
	return {
		averaged: { timeS: ls.waveform.timeS, value: ls.waveform.value, riseTimeS: ls.riseTimeS },
		switching: reach ? { reason: reach } : switchingLoadStep(input, ls.step, durationS),
		truncated
	};
}

/** Designs the synchronous-CCM switching model does not cover. */
function outsideReachOf(detail: AnalysisDetail): string | null {
	const d = detail.document;
	const light = d.plant.lightLoad;
	if (detail.plant.operatingPoint.mode === 'dcm' && (light === 'diode' || light === 'diode-emulation')) {
		return 'The nominal point runs discontinuous (diode or diode emulation); the switching model covers continuous conduction only.';
	}
	return null;
}
