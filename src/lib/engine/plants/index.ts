/** Averaged VM CCM power stages (buck, boost), capacitor banks, modulator. */
export * from './types';
export * from './powerStage';
export * from './operatingPoint';
export * from './modulator';
export { outputNetwork, equivalentBranches, bankImpedance } from './capacitorBank';
export { dominantResonance } from './stageModel';
export { controlledStage } from './controlledStage';
export { currentModeStage, currentModeFeatures, type CurrentModeInput, type CurrentModeFeatures, type CurrentModePlant } from './currentMode';
