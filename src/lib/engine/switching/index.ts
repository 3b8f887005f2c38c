/** The switching model: the switched circuit, its periodic orbit and the virtual loop-gain measurement. */
export * from './check';
export { switchedSystem, type SwitchingCircuitInput, type SwitchedSystem } from './circuit';
export { measureLoopGain, periodsFor, type LoopGainPoint } from './measure';
export { periodicSteadyState, readMultipliers, type MultiplierReading, type PeriodicOrbit } from './steadyState';
export { switchingLoadStep, type SwitchingLoadStep } from './loadStep';
