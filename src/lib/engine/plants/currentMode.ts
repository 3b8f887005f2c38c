/**
 * Constant-frequency, trailing-edge peak current-mode control of the CCM buck and boost: the
 * continuous-time model with the sampling effect (docs/formulas.md §14) built on the averaged
 * stage of stageModel.ts, so the capacitor bank, DCR and RDS(on) enter exactly as in voltage mode.
 *
 * Modulator [published: R. B. Ridley, IEEE Trans. Power Electronics 1991; from memory]:
 *   d̂ = Fm·(v̂c − Ri·He(s)·îL + kf·v̂g + kr·v̂o),  Fm = 1/((Sn + Se)·Ts),
 *   He(s) ≈ 1 − s·Ts/2 + s²·Ts²/π²  (zeros at ±j·π/Ts, i.e. at fsw/2).
 * With the stage's own duty→current and duty→output responses over the common denominator Δ
 * (Gid = E/Δ, Gvd = A/Δ), closing the current loop gives
 *   Gvc = Fm·A/P,  P = Δ + Fm·Ri·He·E − Fm·kr·A          (control voltage → output)
 * and, by the identities B·E − A·F and Z·E + A·G (derived in docs/formulas.md §14.3),
 *   Gvg,cm = (B + Fm·kf·A + Fm·Ri·He·IL·R·Q·[boost])/P,   Zo,cm = (Z + Fm·Ri·He·Vsw·R·Q)/P.
 */
import { polyAdd, polyMul, polyScale, type Poly } from '../math/polynomial';
import { realRoot, type FactoredTf, type Root } from '../tf/types';
import { fromPolynomials } from '../tf/convert';
import { outputNetwork, stageDenominator } from './capacitorBank';
import { factorNormalised } from './factorPoly';
import { OUTSIDE_MODEL_CODE, powerStage } from './powerStage';
import type { PlantModel, PowerStageInput } from './types';
import { formatEng } from '../../units/format';

export interface CurrentModeInput {
	/** Ri: sensed voltage per ampere of inductor current at the comparator, V/A. */
	senseGain: number;
	/** Se: slope of the compensation ramp at the comparator, V/s (0 allowed). */
	rampSlope: number;
}

/** Subharmonic verdict of the current loop: Qp of the fsw/2 pair, or no damping at all. */
export type SubharmonicState = 'damped' | 'peaking' | 'unstable';

export interface CurrentModeFeatures {
	/** Sensed on-time slope Ri·m1, off-time slope Ri·m2, ramp slope Se, V/s. */
	sn: number;
	sf: number;
	se: number;
	/** mc = 1 + Se/Sn. */
	mc: number;
	/** Qp = 1/(π(mc·D′ − 0.5)) of the double pole at fsw/2; null when mc·D′ = 0.5 exactly. */
	qp: number | null;
	subharmonic: SubharmonicState;
	/** Ramp slopes that cure it: the least for a stable current loop ((Sf − Sn)/2, 0 when D < 0.5), for Qp = 1, and Sf/2 (stable at any duty). */
	seForStability: number;
	seForQpOne: number;
	seHalfSf: number;
	/** Low-frequency pole of Gvc from the closed current loop's poles, Hz. */
	lowFrequencyPoleHz: number;
}

/** Above this Qp the fsw/2 peak eats most of the gain margin [common practice: keep Qp near 1]. */
export const QP_PEAKING = 2;

export interface CurrentModePlant extends PlantModel {
	currentMode: CurrentModeFeatures;
}

/** Slopes, mc, Qp and the ramp that would cure subharmonic oscillation (docs/formulas.md §14.2). */
export function currentModeFeatures(duty: number, rippleCurrent: number, fswHz: number, cm: CurrentModeInput): Omit<CurrentModeFeatures, 'lowFrequencyPoleHz'> {
	const Ts = 1 / fswHz;
	const Dc = 1 - duty;
	// In steady state the ripple rises over D·Ts and falls over D′·Ts (m1·D = m2·D′).
	const sn = (cm.senseGain * rippleCurrent) / (duty * Ts);
	const sf = (cm.senseGain * rippleCurrent) / (Dc * Ts);
	const se = cm.rampSlope;
	const mc = 1 + se / sn;
	const x = mc * Dc - 0.5;
	const qp = x === 0 ? null : 1 / (Math.PI * x);
	const subharmonic: SubharmonicState = x <= 0 ? 'unstable' : qp !== null && qp > QP_PEAKING ? 'peaking' : 'damped';
	return {
		sn,
		sf,
		se,
		mc,
		qp,
		subharmonic,
		seForStability: Math.max(0, (sf - sn) / 2),
		seForQpOne: Math.max(0, sn * ((0.5 + 1 / Math.PI) / Dc - 1)),
		seHalfSf: sf / 2
	};
}

/**
 * Fm, kf, kr of d̂ = Fm·(v̂c − Ri·He·îL + kf·v̂g + kr·v̂o) [published: Ridley 1991, from memory;
 * signs derived in docs/formulas.md §14.1 so that the DC gain matches the ripple geometry].
 */
export function modulatorGains(topology: 'buck' | 'boost', duty: number, l: number, fswHz: number, f: { sn: number; se: number }, cm: CurrentModeInput) {
	const Ts = 1 / fswHz;
	const Ri = cm.senseGain;
	const Dc = 1 - duty;
	const boost = topology === 'boost';
	return {
		fm: 1 / ((f.sn + f.se) * Ts),
		kf: boost ? (-Ri * Ts) / (2 * l) : (-Ri * duty * (1 - duty / 2) * Ts) / l,
		kr: boost ? (Ri * Dc * Dc * Ts) / (2 * l) : (Ri * Ts) / (2 * l)
	};
}

/** Ridley's second-order stand-in for the sample-and-hold He(s), ascending in s. */
export const samplingPoly = (Ts: number): number[] => [1, -Ts / 2, (Ts * Ts) / (Math.PI * Math.PI)];

const tf = (gain: number, zeros: Root[], poles: Root[]): FactoredTf => ({ gain, originPower: 0, zeros, poles });

/**
 * The averaged stage with the peak-current loop closed: `gvd` is the control-voltage→output
 * response Gvc (the comparator's input to vout), `gvg`, `zo` and `zd` the line, output and input
 * responses with the current loop closed (ZD with vc held). ZN, the input impedance with the
 * output nulled, does not depend on the control method and stays the stage's (docs/formulas.md §14.6).
 */
export function currentModeStage(input: PowerStageInput, cm: CurrentModeInput): CurrentModePlant {
	const asTyped = powerStage(input);
	// Below the CCM boundary with diode emulation or a diode the stage runs in DCM, where this CCM
	// model does not hold: the CCM algebra keeps the numbers finite and the corner is marked
	// outside the model, so the verdict leaves it out of the margins (as in voltage mode).
	const dcm = input.lightLoad !== undefined && input.lightLoad !== 'forced-ccm' && asTyped.operatingPoint.mode === 'dcm';
	const vm = dcm ? powerStage({ ...input, lightLoad: 'forced-ccm' }) : asTyped;
	const op = dcm ? { ...vm.operatingPoint, mode: 'dcm' as const } : vm.operatingPoint;
	const net = outputNetwork(input.capacitors);
	const R = op.rLoad;
	const r = op.rSeries;
	const L = input.l;
	const Ts = 1 / input.fswHz;
	const D = op.duty;
	const Dc = 1 - D;
	const IL = op.inductorCurrent;
	const boost = input.topology === 'boost';
	const Ri = cm.senseGain;
	const f = currentModeFeatures(D, op.rippleCurrent, input.fswHz, cm);
	const { fm: Fm, kf, kr } = modulatorGains(input.topology, D, L, input.fswHz, f, cm);

	const k = boost ? Dc * Dc : 1;
	const delta = stageDenominator(net, r, L, R, k);
	const qrs = polyAdd(net.qPoly, polyScale(net.sPoly, R));
	const rq = polyScale(net.qPoly, R);
	// Numerators over Δ: A (duty→vout), E (duty→iL), B (line→vout), Z (output impedance).
	const vsw = boost ? input.vout : input.vin; // the switch-node step that d̂ drives across L
	const A: Poly = boost ? polyMul(rq, [IL * (Dc * Dc * R - r), -IL * L]) : polyScale(rq, input.vin);
	const E: Poly = boost ? polyAdd(polyScale(qrs, input.vout), polyScale(rq, Dc * IL)) : polyScale(qrs, input.vin);
	const B: Poly = polyScale(rq, boost ? Dc : D);
	const Z: Poly = polyMul([r, L], rq);
	const he = samplingPoly(Ts);
	const P = polyAdd(polyAdd(delta, polyScale(polyMul(he, E), Fm * Ri)), polyScale(A, -Fm * kr));
	const poles = factorNormalised(P);

	const gvcZeros: Root[] = [...net.qFactors];
	if (boost) gvcZeros.push(realRoot(-(Dc * Dc * R - r) / L));
	const gvc = tf((Fm * A[0]) / P[0], gvcZeros, poles);

	let lineNum = polyAdd(B, polyScale(A, Fm * kf));
	if (boost) lineNum = polyAdd(lineNum, polyScale(polyMul(he, rq), Fm * Ri * IL));
	const gvg = withPoles(lineNum, P, poles);
	const zo = withPoles(polyAdd(Z, polyScale(polyMul(he, rq), Fm * Ri * vsw)), P, poles);
	const zd = currentModeZd({ boost, D, IL, R, Fm, Ri, kf, kr, delta, qrs, rq, E, B, he, P }, poles);

	const lowestPole = Math.min(...poles.map((p) => (p.kind === 'real' ? Math.abs(p.omega) : p.omega0)));
	const currentMode: CurrentModeFeatures = { ...f, lowFrequencyPoleHz: lowestPole / (2 * Math.PI) };
	const outside = {
		code: OUTSIDE_MODEL_CODE,
		message: `Outside the model: the inductor current runs discontinuous below ${formatEng(op.criticalLoadCurrent, 'A')} (this load: ${formatEng(input.iout, 'A')}), and the peak current-mode model here is for CCM only; this corner is left out of the margins.`
	};
	const warnings = [...(dcm ? [outside] : vm.warnings), ...currentModeWarnings(currentMode, D, input.fswHz)];
	return { ...vm, operatingPoint: op, gvd: gvc, gvg, zo, zd, warnings, currentMode };
}

/**
 * ZD with the current loop closed: the stage's input impedance v̂g/îg with the control voltage
 * held (v̂c = 0), the "D" of Middlebrook's extra-element form, whose control input here is vc
 * [derived, docs/formulas.md §14.6]. With îL = (E·d̂ + F·v̂g)/Δ, v̂ = (A·d̂ + B·v̂g)/Δ and the
 * comparator's law, Δ cancels (B·E − A·F as in §14.3):
 *   îL/v̂g = (F + Fm·kf·E + [boost] Fm·kr·IL·R·Q)/P,   d̂/v̂g = Fm·(kf·Δ + kr·B − Ri·He·F)/P,
 * with F = D·(Q + R·S) (buck) or Q + R·S (boost); îg = D·îL + IL·d̂ (buck) or îL (boost).
 * Without the current loop (Fm → 0) it is the voltage-mode ZD of stageModel.ts.
 */
function currentModeZd(
	x: { boost: boolean; D: number; IL: number; R: number; Fm: number; Ri: number; kf: number; kr: number; delta: Poly; qrs: Poly; rq: Poly; E: Poly; B: Poly; he: Poly; P: Poly },
	poles: Root[]
): FactoredTf {
	const F = x.boost ? x.qrs : polyScale(x.qrs, x.D);
	let currentNum = polyAdd(F, polyScale(x.E, x.Fm * x.kf));
	if (x.boost) currentNum = polyAdd(currentNum, polyScale(x.rq, x.Fm * x.kr * x.IL));
	let admittanceNum = currentNum;
	if (!x.boost) {
		const dutyNum = polyAdd(polyAdd(polyScale(x.delta, x.kf), polyScale(x.B, x.kr)), polyScale(polyMul(x.he, F), -x.Ri));
		admittanceNum = polyAdd(polyScale(currentNum, x.D), polyScale(dutyNum, x.IL * x.Fm));
	}
	// ZD = P/admittanceNum: P's roots (already known) are its zeros.
	const y = fromPolynomials(admittanceNum, [1]);
	return { gain: x.P[0] / y.gain, originPower: -y.originPower, zeros: poles, poles: y.zeros };
}

/** num/P with P's factors already known (only the numerator is factored here). */
function withPoles(num: Poly, P: Poly, poles: Root[]): FactoredTf {
	const z = fromPolynomials(num, [1]);
	return { gain: z.gain / P[0], originPower: z.originPower, zeros: z.zeros, poles };
}

/** Subharmonic oscillation and fsw/2 peaking, each with the ramp slope that cures it. */
export function currentModeWarnings(f: CurrentModeFeatures, duty: number, fswHz: number) {
	const slope = (x: number) => formatEng(x, 'V/s');
	const out: { code: string; message: string }[] = [];
	if (f.subharmonic === 'unstable') {
		out.push({
			code: 'subharmonic-unstable',
			message: `The current loop oscillates at fsw/2 (${formatEng(fswHz / 2, 'Hz')}): duty ${duty.toFixed(2)} with mc·D′ = ${(f.mc * (1 - duty)).toFixed(2)} ≤ 0.5. A compensation ramp above ${slope(f.seForStability)} stops it; ${slope(f.seForQpOne)} gives Qp = 1, and Sf/2 = ${slope(f.seHalfSf)} keeps it stable at any duty.`
		});
	} else if (f.subharmonic === 'peaking') {
		out.push({
			code: 'subharmonic-peaking',
			message: `The double pole at fsw/2 has Qp = ${f.qp!.toFixed(1)} (above ${QP_PEAKING}): its peak leaves little gain margin and a load step rings at fsw/2. A compensation ramp of ${slope(f.seForQpOne)} gives Qp = 1.`
		});
	}
	return out;
}
