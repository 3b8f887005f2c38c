/**
 * DC operating point of the VM buck and boost in CCM (docs/formulas.md §1.1, §2.1, §4):
 * buck D = V(R + r)/(Vg·R), η = R/(R + r); boost DC-transformer with series resistance,
 * D' = [Vg·R + sqrt(Vg²R² − 4V²Rr)]/(2VR), η = 1/(1 + r/(D'²R)) [published: E&M ch. 3];
 * ripple [published: E&M ch. 2]; CCM/DCM boundary K > Kcrit [published: E&M ch. 5; from memory].
 */
import { DesignInputError } from '../errors';
import { bankImpedance, type EquivalentBranch } from './capacitorBank';
import type { OperatingPoint, PowerStageInput } from './types';
import { formatEng, formatPart } from '../../units/format';

/** Duty cycles at or above this are rejected (contract rule). */
export const MAX_DUTY = 0.95;

export function operatingPoint(p: PowerStageInput, branches: readonly EquivalentBranch[]): OperatingPoint {
	const R = p.vout / p.iout;
	const r = p.dcr + p.rdsOn;
	const V = p.vout;
	const Vg = p.vin;
	const Ts = 1 / p.fswHz;
	const cTotal = branches.reduce((a, b) => a + b.c, 0);
	// ESR part of the ripple: real part of the bank impedance at fsw (exactly Rc for one branch
	// without ESL) [common practice].
	const [esrAtFsw] = bankImpedance(branches, 2 * Math.PI * p.fswHz);

	if (p.topology === 'buck') {
		const D = (V * (R + r)) / (Vg * R);
		if (!(D < MAX_DUTY)) {
			throw new DesignInputError({
				'plant.vout': `needs duty ${D.toFixed(3)} (with conduction losses); duty must stay below ${MAX_DUTY}`
			});
		}
		const IL = V / R;
		const ripple = (V * (1 - D) * Ts) / p.l;
		const capacitive = ripple / (8 * p.fswHz * cTotal);
		const esr = esrAtFsw * ripple;
		const lCrit = ((1 - D) * R) / (2 * p.fswHz);
		const rCrit = (2 * p.l * p.fswHz) / (1 - D);
		return {
			duty: D,
			efficiency: R / (R + r),
			rLoad: R,
			rSeries: r,
			inductorCurrent: IL,
			rippleCurrent: ripple,
			outputRipple: { capacitive, esr, total: capacitive + esr },
			mode: p.l > lCrit ? 'ccm' : 'dcm',
			criticalInductance: lCrit,
			criticalLoadResistance: rCrit,
			criticalLoadCurrent: V / rCrit
		};
	}

	// Boost: V/Vg = D'R/(D'²R + r) → V·R·D'² − Vg·R·D' + V·r = 0, larger root.
	const disc = Vg * Vg * R * R - 4 * V * V * R * r;
	if (!(disc >= 0)) {
		const maxV = 0.5 * Vg * Math.sqrt(R / r);
		throw new DesignInputError({
			'plant.vout': `beyond the boost's maximum gain: with r = ${formatPart(r, 'Ω')} and R = ${formatPart(R, 'Ω')} the output can reach at most ${formatEng(maxV, 'V', { digits: 4 })}`
		});
	}
	const Dc = (Vg * R + Math.sqrt(disc)) / (2 * V * R);
	const D = 1 - Dc;
	if (!(D < MAX_DUTY)) {
		throw new DesignInputError({
			'plant.vout': `needs duty ${D.toFixed(3)} (with conduction losses); duty must stay below ${MAX_DUTY}`
		});
	}
	if (!(Dc * Dc * R - r > 0)) {
		throw new DesignInputError({ 'plant.vout': "at or beyond the boost's maximum-gain point (D'²R ≤ r)" });
	}
	const IL = V / (Dc * R);
	const ripple = (Vg * D * Ts) / p.l;
	const capacitive = (V * D) / (R * cTotal * p.fswHz);
	const esr = esrAtFsw * (IL + ripple / 2);
	const lCrit = (D * Dc * Dc * R) / (2 * p.fswHz);
	const rCrit = (2 * p.l * p.fswHz) / (D * Dc * Dc);
	return {
		duty: D,
		efficiency: 1 / (1 + r / (Dc * Dc * R)),
		rLoad: R,
		rSeries: r,
		inductorCurrent: IL,
		rippleCurrent: ripple,
		outputRipple: { capacitive, esr, total: capacitive + esr },
		mode: p.l > lCrit ? 'ccm' : 'dcm',
		criticalInductance: lCrit,
		criticalLoadResistance: rCrit,
		criticalLoadCurrent: V / rCrit
	};
}

