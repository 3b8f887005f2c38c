// Plain-words checks on a compensated loop [common practice, docs/formulas.md §6.4, §7.2, §5.6]: crossover against
// fsw/5, the RHP-zero rule (crossoverLimit.ts) and the LC resonance; network poles above fsw/2 (outside the averaged model);
// conditional stability; target missed; op-amp loop gain below 10× the noise gain between fc and the top pole.
import { fmtHz } from '../synthesis/networks';
import { rhpZeroWarning } from './crossoverLimit';
import { formatDb, formatDeg } from '../../units/format';
import type { NetworkParts } from '../synthesis/networks';
import type { LoopCheck } from './loopCheck';
import type { DesignWarning, PlantFeatures } from './placement';
import { noiseGainMagnitude, opampGainMagnitude, type OpampModel } from './transfer';

const deg = formatDeg;

export function crossoverWarnings(fcHz: number, fswHz: number, features: PlantFeatures): DesignWarning[] {
	const out: DesignWarning[] = [];
	if (fcHz > fswHz / 5) {
		out.push({
			code: 'crossover-above-fsw-fifth',
			message:
				`Crossover ${fmtHz(fcHz)} is above fsw/5 (${fmtHz(fswHz / 5)}); the averaged model and the sampling of the PWM ` +
				`make the loop unreliable there. Aim for fsw/10 (${fmtHz(fswHz / 10)}) or below.`
		});
	}
	const rhp = rhpZeroWarning(fcHz, features.rhpZeroHz);
	if (rhp) out.push(rhp);
	const ratio = fcHz / features.f0Hz;
	if (ratio > 0.5 && ratio < 2) {
		out.push({
			code: 'crossover-near-resonance',
			message:
				`Crossover ${fmtHz(fcHz)} is within a factor of 2 of the LC resonance (${fmtHz(features.f0Hz)}), where the plant ` +
				`gain peaks and its phase falls fastest, so small changes move the margins a lot. Put fc below ` +
				`${fmtHz(features.f0Hz / 2)} or well above the resonance (3× or more is usual).`
		});
	}
	return out;
}

export function poleWarnings(polesHz: readonly number[], fswHz: number): DesignWarning[] {
	const half = fswHz / 2;
	const high = polesHz.filter((p) => p > half * (1 + 1e-9));
	if (!high.length) return [];
	// A double pole (K-factor Type III) is named once.
	const distinct = high.filter((p, i) => high.findIndex((q) => Math.abs(q - p) <= 1e-9 * p) === i);
	const label = distinct.map((p) => fmtHz(p) + (high.filter((q) => Math.abs(q - p) <= 1e-9 * p).length > 1 ? ' (double)' : ''));
	return [
		{
			code: 'pole-above-half-fsw',
			message:
				`Compensator pole${high.length > 1 ? 's at ' + label.join(', ') + ' sit' : ' at ' + label[0] + ' sits'} ` +
				`above fsw/2 (${fmtHz(half)}), ` +
				`beyond what the averaged model describes, so they do not filter switching ripple as intended. ` +
				`Lower the crossover or the boost so the poles fall at or below fsw/2.`
		}
	];
}

/** Warnings about the loop that would be built, judged against the target where one was given. */
export function loopWarnings(loop: LoopCheck, target: { crossoverHz?: number; phaseMarginDeg?: number } | undefined): DesignWarning[] {
	const out: DesignWarning[] = [];
	if (loop.crossoverHz === null || loop.phaseMarginDeg === null) {
		out.push({ code: 'no-crossover', message: 'The loop gain never crosses 1 (0 dB) in the analysed range; the design has no crossover.' });
		return out;
	}
	if (loop.crossovers.length > 1) {
		out.push({
			code: 'multiple-crossovers',
			message: `The loop gain crosses 0 dB ${loop.crossovers.length} times (${loop.crossovers.map((c) => fmtHz(c.freqHz)).join(', ')}); check every crossing.`
		});
	}
	const unstable = loop.closedLoopStable === false || (loop.closedLoopStable === null && loop.phaseMarginDeg <= 0);
	if (unstable) {
		out.push({
			code: 'unstable',
			message:
				`The closed loop is unstable (phase margin ${deg(loop.phaseMarginDeg)} at ${fmtHz(loop.crossoverHz)}); it would oscillate. ` +
				`Lower the crossover or add phase boost.`
		});
	} else if (loop.conditionalAtHz !== null) {
		out.push({
			code: 'conditionally-stable',
			message:
				`The loop phase crosses −180° at ${fmtHz(loop.conditionalAtHz)} while the gain is still above 1 ` +
				`(${formatDb(-loop.gainReductionMarginDb!)}): conditionally stable, so a drop in loop gain of that much ` +
				`(light load, low input, a saturated amplifier) can make it oscillate. Move the compensator zeros down toward ` +
				`the LC resonance, or lower the Q of the output filter.`
		});
	}
	if (target?.phaseMarginDeg !== undefined && loop.phaseMarginDeg < target.phaseMarginDeg - 1) {
		out.push({
			code: 'pm-below-target',
			message: `Achieved phase margin ${deg(loop.phaseMarginDeg)} at ${fmtHz(loop.crossoverHz)} is below the ${deg(target.phaseMarginDeg)} the network was placed for (rounded parts or a placement limit).`
		});
	}
	if (target?.crossoverHz !== undefined && Math.abs(Math.log(loop.crossoverHz / target.crossoverHz)) > Math.log(1.1)) {
		out.push({
			code: 'crossover-off-target',
			message: `Achieved crossover ${fmtHz(loop.crossoverHz)} is more than 10 % away from the ${fmtHz(target.crossoverHz)} the network was placed for.`
		});
	}
	return out;
}

/**
 * The op-amp must keep |A| ≥ 10·|NG| from fc up to the highest network pole (§5.6 rule) [common practice].
 * The estimate of the GBW needed uses A ≈ GBW/f above the op-amp's own pole.
 */
export function opampWarnings(parts: NetworkParts, opamp: OpampModel, fcHz: number, polesHz: readonly number[]): DesignWarning[] {
	if (parts.kind === 'type2-ota') return [];
	const top = Math.max(fcHz, ...polesHz.filter((p) => p > 0));
	let worst = { ratio: Infinity, freqHz: fcHz };
	let neededGbw = 0;
	const n = 60;
	for (let i = 0; i <= n; i++) {
		const f = fcHz * (top / fcHz) ** (i / n);
		const ng = noiseGainMagnitude(parts, f);
		const ratio = opampGainMagnitude(opamp, f) / ng;
		if (ratio < worst.ratio) worst = { ratio, freqHz: f };
		neededGbw = Math.max(neededGbw, 10 * ng * f);
	}
	if (worst.ratio >= 10) return [];
	return [
		{
			code: 'opamp-gbw-too-low',
			message:
				`The op-amp's gain is only ${+worst.ratio.toFixed(1)}× the noise gain at ${fmtHz(worst.freqHz)} (rule: 10× or more from fc ` +
				`to the highest compensator pole), so it reshapes the compensator. An op-amp of about ${fmtHz(neededGbw)} GBW or ` +
				`more would keep 10×` +
				(parts.kind === 'type3' ? '; a larger R3 also lowers the noise-gain plateau.' : '.')
		}
	];
}
