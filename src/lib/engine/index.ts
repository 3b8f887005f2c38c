/**
 * Loopwright analysis engine: public surface (pure TypeScript, no I/O).
 *
 * API note
 * - Transfer functions (tf/): `FactoredTf = { gain, originPower, zeros: Root[], poles: Root[], delayS? }`
 *   meaning gain · s^originPower · Π(zeros)/Π(poles) · e^(−s·delayS), every factor normalised to 1
 *   at s = 0: `RealRoot {kind:'real', omega}` is (1 + s/omega), omega < 0 = RHP;
 *   `PairRoot {kind:'pair', omega0, q}` is 1 + s/(q·omega0) + s²/omega0², q < 0 = RHP pair.
 *   Build with `realRoot`, `realRootHz`, `pairRoot`, `pairRootHz`, `constantTf`.
 *   Algebra: `multiply(...tfs)`, `divide`, `invert`, `scale`, `withDelay`, `cancelCommon`.
 *   Evaluate: `evaluate(tf, omega) → {re, im}`, `evaluatePolar(tf, omega) → {magDb, phaseDeg}`,
 *   `frequencyResponse(tf, freqHz: Float64Array) → {freqHz, magDb, phaseDeg}` (phase unwrapped
 *   from the factors, delay exact), `compileTf` + `lnMagPhaseAt` for hot loops.
 *   Convert: `toPolynomials(tf, {padeOrder})`, `fromPolynomials(num, den)`, `fromZpk`, `toZpk`,
 *   `padeDelay(Td, n)`. Polynomials are ASCENDING arrays (p[i] multiplies s^i) everywhere.
 * - Math (math/): `polyRoots(p) → {roots, backwardError, method}` (Aberth + companion fallback).
 * - Sweep (sweep/): `logGrid(startHz, stopHz, points)`, `logGridPerDecade`, `mergeGrids`, `defaultSweepRange`.
 * - Plants (plants/): `powerStage(input: PowerStageInput) → PlantModel` = { operatingPoint, features,
 *   gvd, gvg, zo, zd, zn (FactoredTf), warnings }; throws `DesignInputError` (fields by document
 *   path) for duty ≥ 0.95 or a boost beyond its maximum gain. `modulatorTf(mod, vin, vinNominal?)`.
 * - Analysis (analysis/): `loopMetrics(loop, {startHz, stopHz}, options?) → LoopMetrics` (every
 *   crossing, PM/GM/gain-reduction/delay/modulus margins, null + `unavailable[reason]`),
 *   `closedLoopStability(loop, {padeOrder?, accurateToHz?})` (roots of den + num).
 * - Contract (contract/): `designDocumentSchema`, `analysisResponseSchema`, `contractError`, `zodFields`.
 * - Pipeline: `analyzeDesign(doc: unknown, {includeResponse?}) → AnalysisResponse | ContractError`,
 *   `analyzeDesignDetailed` (also returns the plant model, loop and metrics),
 *   `analyzeValidatedDesign(document)` (the same for a document designDocumentSchema already parsed).
 * - Verdict (verify/): `verifyDesign(doc: unknown) → Verification | ContractError` and
 *   `verifyValidatedDesign(document)`: operating × tolerance corners, worst PM/GM/fc with their
 *   corners, stability, spread yield, warnings per corner, pass/caution/fail against `targets`,
 *   stamped with `ENGINE_VERSION`.
 * - Switching check (switching/): `switchingCheckOfDesign(doc, {freqHz?, onProgress?})` → the
 *   periodic orbit, its Floquet multipliers and the loop gain measured on the switched circuit
 *   beside the averaged margins (docs/formulas.md §13).
 */
export * from './math';
export * from './tf';
export * from './sweep';
export * from './errors';
export * from './plants';
export * from './analysis';
export * from './contract';
export * from './analyze';
export * from './verify';
export * from './pipeline';
export * from './switching';
export { ENGINE_VERSION } from './version';
