// Private loop check used by placement and warnings until the engine's margins module (analysis/) exists:
// every gain crossover of T on a dense log grid, refined by bisection on ln|T|, with its phase margin from the
// unwrapped phase; plus "phase below −180° while |T| > 1" (conditional stability). Domain sheet §7.1, §7.5.
import { compileTf, lnMagPhaseAt, type FactoredTf } from '../tf';

export interface CrossoverPoint {
	freqHz: number;
	/** 180° + ∠T, reduced to (−180°, 180°]. */
	phaseMarginDeg: number;
}

export interface LoopCheck {
	/** Every |T| = 1 crossing, ascending. */
	crossovers: CrossoverPoint[];
	/** The crossing with the smallest phase margin (null when |T| never crosses 1 in the range). */
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	/** Lowest unwrapped phase (deg) at a grid point where |T| > 1 below the last crossover, or null if none is < −180°. */
	conditionalDipDeg: number | null;
	/** Frequency of that dip. */
	conditionalDipHz: number | null;
}

const POINTS_PER_DECADE = 200;
const RAD2DEG = 180 / Math.PI;

/** Reduce an angle in degrees to (−180, 180]. */
export function reduceDeg(a: number): number {
	let r = a % 360;
	if (r > 180) r -= 360;
	if (r <= -180) r += 360;
	return r;
}

export function checkLoop(loop: FactoredTf, startHz: number, stopHz: number): LoopCheck {
	const c = compileTf(loop);
	const out = new Float64Array(2);
	const at = (f: number) => {
		lnMagPhaseAt(c, 2 * Math.PI * f, out);
		return { ln: out[0], phaseDeg: out[1] * RAD2DEG };
	};
	const n = Math.max(2, Math.ceil(Math.log10(stopHz / startHz) * POINTS_PER_DECADE) + 1);
	const step = Math.log(stopHz / startHz) / (n - 1);
	const crossovers: CrossoverPoint[] = [];
	const above: { f: number; phaseDeg: number }[] = [];
	let prevF = startHz;
	let prev = at(startHz);
	if (prev.ln > 0) above.push({ f: startHz, phaseDeg: prev.phaseDeg });
	for (let i = 1; i < n; i++) {
		const f = startHz * Math.exp(step * i);
		const cur = at(f);
		if (cur.ln > 0) above.push({ f, phaseDeg: cur.phaseDeg });
		if (prev.ln === 0 || Math.sign(prev.ln) !== Math.sign(cur.ln)) {
			const fc = prev.ln === 0 ? prevF : bisect(at, prevF, f, prev.ln);
			crossovers.push({ freqHz: fc, phaseMarginDeg: reduceDeg(180 + at(fc).phaseDeg) });
		}
		prevF = f;
		prev = cur;
	}
	const governing = crossovers.reduce<CrossoverPoint | null>(
		(worst, x) => (worst === null || x.phaseMarginDeg < worst.phaseMarginDeg ? x : worst),
		null
	);
	const lastFc = crossovers.length ? crossovers[crossovers.length - 1].freqHz : stopHz;
	let dip: { f: number; phaseDeg: number } | null = null;
	for (const p of above) {
		if (p.f < lastFc && p.phaseDeg < -180 && (dip === null || p.phaseDeg < dip.phaseDeg)) dip = p;
	}
	return {
		crossovers,
		crossoverHz: governing?.freqHz ?? null,
		phaseMarginDeg: governing?.phaseMarginDeg ?? null,
		conditionalDipDeg: dip?.phaseDeg ?? null,
		conditionalDipHz: dip?.f ?? null
	};
}

/** Root of ln|T| between lo and hi (a bracket), bisection in log frequency to ~1e-13 relative. */
function bisect(at: (f: number) => { ln: number }, lo: number, hi: number, lnLo: number): number {
	let a = Math.log(lo);
	let b = Math.log(hi);
	let fa = lnLo;
	for (let k = 0; k < 80 && b - a > 1e-14; k++) {
		const m = 0.5 * (a + b);
		const fm = at(Math.exp(m)).ln;
		if (fm === 0) return Math.exp(m);
		if (Math.sign(fm) === Math.sign(fa)) {
			a = m;
			fa = fm;
		} else b = m;
	}
	return Math.exp(0.5 * (a + b));
}
