/**
 * Rounding of display arrays (closed-loop traces, step waveforms) before they leave the engine:
 * seventeen digits of a plotted trace carry nothing a plot or a bench comparison can use, and they
 * double the size of an analysis answer. Metrics and the loop's own Bode arrays are never rounded.
 */

// Powers of ten up to 1e22 are exact doubles, so x·10^p and the division back are each one
// correctly rounded operation.
const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);

/** x to `digits` significant digits (1…15); 0, NaN and ±Infinity unchanged. */
export function roundSignificant(x: number, digits: number): number {
	if (x === 0 || !Number.isFinite(x)) return x;
	const p = digits - 1 - Math.floor(Math.log10(Math.abs(x)));
	if (p >= 0 && p < POW10.length) return Math.round(x * POW10[p]) / POW10[p];
	if (p < 0 && -p < POW10.length) return Math.round(x / POW10[-p]) * POW10[-p];
	return Number(x.toPrecision(digits)); // beyond 1e±22: rare, and the slow exact way is fine
}

/** x to a fixed number of decimals (0…15), for dB and degrees. */
export function roundDecimals(x: number, decimals: number): number {
	if (!Number.isFinite(x)) return x;
	const s = POW10[decimals];
	return Math.round(x * s) / s;
}
