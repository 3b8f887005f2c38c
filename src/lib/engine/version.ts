/**
 * The engine's results version. Bump it whenever a change can move a stored figure (a margin,
 * the corner set, a verdict rule): stored verdicts carry the version they were computed with, and
 * a re-verification after a bump flags the rails whose verdict changed.
 * History: 2 = governing margins by smallest |PM| / |GM|, one corner set, verdict from the document's targets.
 * 3 = a crossover above a fifth of the RHP zero at any corner is a caution (compensators/crossoverLimit.ts);
 * plausibility warnings (contract/plausibility.ts) join the stored warnings.
 * 4 = corners in DCM of a diode-emulation or diode-rectified stage are analysed with the DCM averaged
 * model (plants/dcmModel.ts) and count in the margins, instead of being left out.
 * 5 = peak current mode: the ramp Vpp is no longer a (meaningless) tolerance corner there, Ri and Se
 * are (corners/variation.ts); the input-filter check uses ZD with the control voltage held
 * (plants/currentMode.ts) instead of the voltage-mode ZD.
 */
export const ENGINE_VERSION = '5';
