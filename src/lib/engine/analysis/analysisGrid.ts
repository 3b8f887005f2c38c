/**
 * The dense internal grid that brackets crossings (formulas §7.5): a log grid at a base
 * density, extra points across each resonant pair (|Q| > 1, spacing ∝ 1/Q around ω0), then
 * adaptive bisection of any interval whose phase or log-magnitude step is too large, so two
 * crossings never share an interval in practice. Values are the analytic ln|T| and unwrapped
 * phase (rad) of the compiled loop.
 */
import { lnMagPhaseAt, type CompiledTf } from '../tf/evaluate';
import type { FactoredTf } from '../tf/types';

export interface GridOptions {
	/** Base density [100 points per decade]. */
	pointsPerDecade?: number;
	/** Subdivide an interval whose phase changes by more than this (rad) [0.35 ≈ 20°]. */
	maxPhaseStep?: number;
	/** Subdivide an interval whose ln|T| changes by more than this [0.6 ≈ 5 dB]. */
	maxLnMagStep?: number;
	/** Maximum bisection depth per base interval [10]. */
	maxDepth?: number;
}

export interface SampledLoop {
	/** Ascending angular frequencies, rad/s. */
	omega: number[];
	lnMag: number[];
	phase: number[];
}

export function sampleLoop(
	tf: FactoredTf,
	c: CompiledTf,
	omegaStart: number,
	omegaStop: number,
	options: GridOptions = {}
): SampledLoop {
	const ppd = options.pointsPerDecade ?? 100;
	const maxPh = options.maxPhaseStep ?? 0.35;
	const maxLn = options.maxLnMagStep ?? 0.6;
	const maxDepth = options.maxDepth ?? 10;

	const logA = Math.log(omegaStart);
	const logB = Math.log(omegaStop);
	const n = Math.max(2, Math.ceil((ppd * (logB - logA)) / Math.LN10) + 1);
	const base: number[] = [];
	for (let i = 0; i < n; i++) base.push(Math.exp(logA + ((logB - logA) * i) / (n - 1)));
	base[0] = omegaStart;
	base[n - 1] = omegaStop;
	// Points across resonances: the phase of a pair turns by ~180° within ω0·(1 ± 1/|Q|).
	for (const r of [...tf.zeros, ...tf.poles]) {
		if (r.kind !== 'pair') continue;
		const aq = Math.abs(r.q);
		if (!(aq > 1)) continue;
		const width = Number.isFinite(aq) ? 1 / aq : 1e-9;
		for (let j = -8; j <= 8; j++) {
			const w = r.omega0 * (1 + (j * width) / 2);
			if (w > omegaStart && w < omegaStop) base.push(w);
		}
	}
	base.sort((a, b) => a - b);

	const out: SampledLoop = { omega: [], lnMag: [], phase: [] };
	const buf = new Float64Array(2);
	const at = (w: number): [number, number] => {
		lnMagPhaseAt(c, w, buf);
		return [buf[0], buf[1]];
	};
	let [prevLn, prevPh] = at(base[0]);
	out.omega.push(base[0]);
	out.lnMag.push(prevLn);
	out.phase.push(prevPh);
	const refine = (wa: number, la: number, pa: number, wb: number, lb: number, pb: number, depth: number) => {
		if (depth < maxDepth && (Math.abs(pb - pa) > maxPh || Math.abs(lb - la) > maxLn)) {
			const wm = Math.sqrt(wa * wb);
			const [lm, pm] = at(wm);
			refine(wa, la, pa, wm, lm, pm, depth + 1);
			refine(wm, lm, pm, wb, lb, pb, depth + 1);
			return;
		}
		out.omega.push(wb);
		out.lnMag.push(lb);
		out.phase.push(pb);
	};
	for (let i = 1; i < base.length; i++) {
		if (base[i] === base[i - 1]) continue;
		const [l, p] = at(base[i]);
		refine(base[i - 1], prevLn, prevPh, base[i], l, p, 0);
		prevLn = l;
		prevPh = p;
	}
	return out;
}
