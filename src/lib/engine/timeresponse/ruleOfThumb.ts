/**
 * Load-step estimates shown beside the simulation (docs/formulas.md §8.2) [common practice]:
 * ΔV ≈ ΔI/(2π·fc·C), valid when Rc ≪ 1/(2π·fc·C) and PM ≈ 45–60°; the broader form
 * ΔV ≈ ΔI·max(Rc, 1/(2π·fc·C)) covers ESR-dominated banks, where the ESR step ΔI·Rc appears at
 * once and the capacitive rule underestimates. Rc of a bank = Re Z_bank(j2πfc).
 */
import { formatDeg, formatEng } from '../../units/format';

export interface RuleOfThumbInput {
	deltaI: number;
	crossoverHz: number;
	/** Total output capacitance, F. */
	cTotal: number;
	/** Effective ESR of the bank at fc, Ω. */
	esr: number;
	phaseMarginDeg?: number | null;
	/** ESR zero(s) of the bank, Hz. */
	esrZeroHz?: readonly number[];
	riseTimeS?: number;
}

export interface RuleOfThumb {
	/** |ΔI|/(2π·fc·C), V. */
	capacitiveV: number;
	/** |ΔI|·Rc, V. */
	esrStepV: number;
	/** |ΔI|·max(Rc, 1/(2π·fc·C)), V. */
	generalV: number;
	/** True when the capacitive rule's conditions hold. */
	applies: boolean;
	notes: { code: string; message: string }[];
}

export function loadStepRuleOfThumb(input: RuleOfThumbInput): RuleOfThumb {
	const dI = Math.abs(input.deltaI);
	const xc = 1 / (2 * Math.PI * input.crossoverHz * input.cTotal);
	const capacitiveV = dI * xc;
	const esrStepV = dI * input.esr;
	const notes: RuleOfThumb['notes'] = [];
	let applies = true;
	if (input.esr >= 0.3 * xc) {
		applies = false;
		notes.push({
			code: 'esr-dominated',
			message:
				input.esr >= xc
					? `ESR-dominated bank: Rc (${formatEng(input.esr, 'Ω')}) exceeds 1/(2π·fc·C) (${formatEng(xc, 'Ω')}), so the ESR step ΔI·Rc sets the peak and ΔI/(2π·fc·C) underestimates it.`
					: `Rc (${formatEng(input.esr, 'Ω')}) is not small against 1/(2π·fc·C) (${formatEng(xc, 'Ω')}); the ESR step adds to the capacitive estimate.`
		});
	}
	const fesr = input.esrZeroHz?.length ? Math.min(...input.esrZeroHz) : null;
	if (fesr !== null && input.crossoverHz > fesr) {
		applies = false;
		notes.push({
			code: 'crossover-above-esr-zero',
			message: `The crossover (${formatEng(input.crossoverHz, 'Hz')}) lies above the ESR zero (${formatEng(fesr, 'Hz')}): the bank looks resistive at fc and the ESR step dominates.`
		});
	}
	const pm = input.phaseMarginDeg;
	if (pm != null && (pm < 45 || pm > 60)) {
		notes.push({
			code: 'phase-margin-outside-rule',
			message: `The rule assumes PM ≈ 45–60°; this loop has ${formatDeg(pm)}, so ringing (low PM) or a slower, lower peak (high PM) moves the real value.`
		});
	}
	if (input.riseTimeS && input.riseTimeS * input.crossoverHz > 0.25) {
		notes.push({
			code: 'slow-edge',
			message: 'The load edge is slow against 1/fc, so the loop follows part of it and the real peak is lower than the rule.'
		});
	}
	return { capacitiveV, esrStepV, generalV: dI * Math.max(input.esr, xc), applies, notes };
}

