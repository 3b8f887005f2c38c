/**
 * Minimal complex value type for engine interfaces. Hot loops use hand-written re/im
 * arithmetic on plain numbers; this type is for roots and single evaluations.
 */
export interface Complex {
	re: number;
	im: number;
}

export const complex = (re: number, im = 0): Complex => ({ re, im });

export function cAbs(z: Complex): number {
	return Math.hypot(z.re, z.im);
}
