/**
 * Numerical phase unwrapping along an ascending frequency axis, for measured data only (the engine unwraps its
 * models from their factors). A step larger than 180° between neighbours is taken as a wrap and removed by whole
 * turns; then the curve is shifted by whole turns so its first point lies in (−270°, 90°], which holds a positive-gain
 * plant (near 0°) and a loop with an integrator (near −90°) alike. Margins use phase modulo 360°, so the shift never
 * changes them. [common practice: the unwrap rule of numpy.unwrap with period 360°]
 */

export interface Unwrapped {
	phaseDeg: number[];
	/** Largest single correction applied between neighbours, degrees (0 when nothing was wrapped). */
	largestJumpDeg: number;
}

export function unwrapPhaseDeg(phaseDeg: readonly number[]): Unwrapped {
	const out = new Array<number>(phaseDeg.length);
	let offset = 0;
	let largest = 0;
	for (let i = 0; i < phaseDeg.length; i++) {
		if (i > 0) {
			const step = phaseDeg[i] + offset - out[i - 1];
			if (Math.abs(step) > 180) {
				const turns = Math.round(step / 360);
				offset -= 360 * turns;
				largest = Math.max(largest, Math.abs(step));
			}
		}
		out[i] = phaseDeg[i] + offset;
	}
	if (out.length > 0) {
		const first = out[0];
		// Shift by k·360 so that −270 < first + shift ≤ 90.
		const shift = -360 * Math.ceil((first - 90) / 360);
		if (shift !== 0) for (let i = 0; i < out.length; i++) out[i] += shift;
	}
	return { phaseDeg: out, largestJumpDeg: largest };
}
