/**
 * Margins read off a sampled loop response (the drag preview's quick answer; on release the
 * engine's full analysis replaces it). Crossings are bracketed between samples and placed by
 * linear interpolation in log f; PM = 180° + ∠T at |T| = 1, reduced to (−180°, 180°]; GM =
 * −|T| dB where the unwrapped phase crosses −180° + k·360° (domain sheet §7.1).
 */

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
	let crossoverHz: number | null = null;
	let phaseMarginDeg: number | null = null;
	let gainMarginDb: number | null = null;
	let phaseCrossoverHz: number | null = null;
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
			const pm = reduceDeg(180 + p0 + t * (p1 - p0));
			if (phaseMarginDeg === null || pm < phaseMarginDeg) {
				phaseMarginDeg = pm;
				crossoverHz = Math.exp(l0 + t * (l1 - l0));
			}
		}
		// Phase lines at −180° + k·360° between these samples.
		const kLo = Math.ceil((Math.min(p0, p1) + 180) / 360);
		const kHi = Math.floor((Math.max(p0, p1) + 180) / 360);
		for (let k = kLo; k <= kHi; k++) {
			const line = -180 + 360 * k;
			if (p0 === p1) continue;
			const t = (p0 - line) / (p0 - p1);
			if (t < 0 || t > 1 || (t === 0 && i > 1)) continue;
			const gm = -(m0 + t * (m1 - m0));
			if (gm > 0 && (gainMarginDb === null || gm < gainMarginDb)) {
				gainMarginDb = gm;
				phaseCrossoverHz = Math.exp(l0 + t * (l1 - l0));
			}
		}
	}
	return { crossoverHz, phaseMarginDeg, gainMarginDb, phaseCrossoverHz };
}
