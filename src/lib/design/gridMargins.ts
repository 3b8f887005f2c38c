/**
 * Margins read off a sampled loop response (the drag preview's quick answer; on release the
 * engine's full analysis replaces it). Crossings are bracketed between samples and placed by
 * linear interpolation in log f; PM = 180° + ∠T at |T| = 1, reduced to (−180°, 180°]; GM =
 * −|T| dB where the unwrapped phase crosses −180° + k·360° (docs/formulas.md §7.1). Which crossing
 * is the headline is the engine's one rule (analysis/margins.ts: smallest |PM|, smallest |GM|,
 * a negative GM included): this preview once kept only positive GMs and showed "no −180°
 * crossing" beside an unstable verdict whose loop crossed −180° at +19 dB.
 */
import { governingCrossover, governingPhaseCrossover } from '$lib/engine/analysis/margins';

export interface GridMargins {
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	gainMarginDb: number | null;
	phaseCrossoverHz: number | null;
}

const reduceDeg = (x: number) => {
	const r = ((((x + 180) % 360) + 360) % 360) - 180;
	return r === -180 ? 180 : r;
};

export function gridMargins(freqHz: ArrayLike<number>, magDb: ArrayLike<number>, phaseDeg: ArrayLike<number>): GridMargins {
	const gains: { freqHz: number; phaseMarginDeg: number }[] = [];
	const phases: { freqHz: number; gainMarginDb: number }[] = [];
	const n = Math.min(freqHz.length, magDb.length, phaseDeg.length);
	for (let i = 1; i < n; i++) {
		const m0 = magDb[i - 1];
		const m1 = magDb[i];
		const p0 = phaseDeg[i - 1];
		const p1 = phaseDeg[i];
		if (![m0, m1, p0, p1].every(Number.isFinite)) continue;
		const l0 = Math.log(freqHz[i - 1]);
		const l1 = Math.log(freqHz[i]);
		if ((m0 >= 0 && m1 < 0) || (m0 < 0 && m1 >= 0)) {
			const t = m0 / (m0 - m1);
			gains.push({ freqHz: Math.exp(l0 + t * (l1 - l0)), phaseMarginDeg: reduceDeg(180 + p0 + t * (p1 - p0)) });
		}
		// Phase lines at −180° + k·360° between these samples.
		if (p0 === p1) continue;
		const kLo = Math.ceil((Math.min(p0, p1) + 180) / 360);
		const kHi = Math.floor((Math.max(p0, p1) + 180) / 360);
		for (let k = kLo; k <= kHi; k++) {
			const line = -180 + 360 * k;
			const t = (p0 - line) / (p0 - p1);
			if (t < 0 || t > 1 || (t === 0 && i > 1)) continue;
			phases.push({ freqHz: Math.exp(l0 + t * (l1 - l0)), gainMarginDb: -(m0 + t * (m1 - m0)) });
		}
	}
	const pm = governingCrossover(gains);
	const gm = governingPhaseCrossover(phases);
	return {
		crossoverHz: pm?.freqHz ?? null,
		phaseMarginDeg: pm?.phaseMarginDeg ?? null,
		gainMarginDb: gm?.gainMarginDb ?? null,
		phaseCrossoverHz: gm?.freqHz ?? null
	};
}
