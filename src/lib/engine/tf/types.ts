/**
 * Factored transfer functions in engineering form (architecture: "representation decides
 * accuracy"). T(s) = gain · s^originPower · Π zeros(s) / Π poles(s) · e^(−s·delayS), each
 * factor normalised to 1 at s = 0, so `gain` is the DC gain when originPower = 0 and the
 * coefficient of s^originPower (s in rad/s) otherwise. Frequencies inside are rad/s.
 */

/**
 * First-order factor (1 + s/omega).
 * omega > 0: left-half-plane root at s = −omega (ordinary pole/zero).
 * omega < 0: right-half-plane root at s = |omega|, i.e. factor (1 − s/|omega|) (RHP zero).
 */
export interface RealRoot {
	kind: 'real';
	omega: number;
}

/**
 * Second-order factor 1 + s/(q·omega0) + s²/omega0² (omega0 > 0).
 * q > 0: left-half-plane pair; q < 0: right-half-plane pair; q = ±Infinity: undamped pair
 * on the jω axis. |q| ≤ 1/2 is allowed and means two real roots of the same sign.
 */
export interface PairRoot {
	kind: 'pair';
	omega0: number;
	q: number;
}

export type Root = RealRoot | PairRoot;

export interface FactoredTf {
	/** DC gain (originPower = 0) or the coefficient of s^originPower. May be negative. */
	gain: number;
	/** +n: n zeros at s = 0 (differentiators); −n: n integrators. */
	originPower: number;
	zeros: Root[];
	poles: Root[];
	/** Pure delay in seconds, e^(−s·delayS); absent means 0. */
	delayS?: number;
}

export const realRoot = (omega: number): RealRoot => ({ kind: 'real', omega });
export const pairRoot = (omega0: number, q: number): PairRoot => ({ kind: 'pair', omega0, q });

/** Real root placed at a frequency in Hz (LHP); `rhp` puts it in the right half plane. */
export const realRootHz = (freqHz: number, rhp = false): RealRoot =>
	realRoot((rhp ? -1 : 1) * 2 * Math.PI * freqHz);

export const pairRootHz = (f0Hz: number, q: number): PairRoot => pairRoot(2 * Math.PI * f0Hz, q);

/** The constant transfer function k. */
export const constantTf = (k: number): FactoredTf => ({ gain: k, originPower: 0, zeros: [], poles: [] });

/** Corner frequency of a factor in Hz (|omega|/2π or omega0/2π). */
export function rootFreqHz(r: Root): number {
	return (r.kind === 'real' ? Math.abs(r.omega) : r.omega0) / (2 * Math.PI);
}

/** True when the factor has its root(s) in the open right half plane. */
export function isRhp(r: Root): boolean {
	return r.kind === 'real' ? r.omega < 0 : r.q < 0 && Number.isFinite(r.q);
}

/** Order of a factor (1 or 2). */
export const rootOrder = (r: Root): number => (r.kind === 'real' ? 1 : 2);
