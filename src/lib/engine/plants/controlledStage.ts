/**
 * The stage as the loop sees it, by control method: voltage mode is the averaged stage with the
 * duty as its input (the modulator's 1/VM is a separate factor); peak current mode closes the
 * current loop inside (plants/currentMode.ts) and starts at the comparator's control voltage.
 * Every caller that builds a loop (analyze, corners, spread, placement for the worst corner)
 * goes through here, so both methods flow through the same pipeline.
 */
import { currentModeStage } from './currentMode';
import type { ModulatorInput } from './modulator';
import { powerStage } from './powerStage';
import type { PlantModel, PowerStageInput } from './types';

export function controlledStage(stage: PowerStageInput, modulator: ModulatorInput): PlantModel {
	return modulator.currentMode ? currentModeStage(stage, modulator.currentMode) : powerStage(stage);
}
