import { describe, expect, it } from 'vitest';
import { loopMetrics } from '$lib/engine/analysis';
import { evaluatePolar, pairRoot, realRoot, type FactoredTf } from '$lib/engine/tf';

const TWO_PI = 2 * Math.PI;
const hz = (w: number) => w / TWO_PI;

/** Routh–Hurwitz test of a real polynomial (ascending coefficients): true iff all roots in the open LHP. */
function routhStable(ascending: number[]): boolean {
	const desc = [...ascending].reverse();
	if (desc.some((c) => c <= 0)) return false;
	let rows: number[][] = [desc.filter((_, i) => i % 2 === 0), desc.filter((_, i) => i % 2 === 1)];
	for (let k = 0; k < desc.length - 2; k++) {
		const [a, b] = rows.slice(-2);
		if (b[0] === 0) return false;
		const next: number[] = [];
		for (let j = 0; j < a.length - 1; j++) next.push((b[0] * (a[j + 1] ?? 0) - a[0] * (b[j + 1] ?? 0)) / b[0]);
		rows = [...rows, next.length ? next : [0]];
	}
	return rows.every((r) => r[0] > 0);
}
// [published: Routh–Hurwitz criterion — any control text; implemented here independently of root finding]

describe('single crossings with hand-derivable margins', () => {
	it('integrator ωc/s: crossover at ωc, PM 90°, no GM, delay margin (π/2)/ωc', () => {
		// [hand-derivable]
		const wc = TWO_PI * 10e3;
		const m = loopMetrics({ gain: wc, originPower: -1, zeros: [], poles: [] }, { startHz: 10, stopHz: 1e7 });
		expect(m.crossovers.length).toBe(1);
		expect(m.crossoverHz).toBeCloseTo(10e3, 6);
		expect(m.phaseMarginDeg).toBeCloseTo(90, 10);
		expect(m.gainMarginDb).toBeNull();
		expect(m.unavailable.gainMarginDb).toMatch(/never reaches −180°/);
		expect(m.delayMarginS).toBeCloseTo(0.25 / 10e3, 14);
		expect(m.closedLoopStable).toBe(true);
		// |1 + ωc/(jω)| ≥ 1, smallest at the top of the range
		expect(m.modulusMargin).toBeCloseTo(Math.hypot(1, 1e-3), 9);
	});

	it('K/(s(1 + s/ωp)): ωc from the quadratic in ωc², PM = 90° − atan(ωc/ωp)', () => {
		// [hand-derivable: ωc²(1 + ωc²/ωp²) = K²]
		const K = 5e4;
		const wp = 3e4;
		const m = loopMetrics({ gain: K, originPower: -1, zeros: [], poles: [realRoot(wp)] }, { startHz: 1, stopHz: 1e7 });
		const wc = Math.sqrt(((wp * wp) / 2) * (-1 + Math.sqrt(1 + (4 * K * K) / (wp * wp))));
		expect(m.crossoverHz).toBeCloseTo(hz(wc), 6);
		expect(m.phaseMarginDeg).toBeCloseTo(90 - (Math.atan(wc / wp) * 180) / Math.PI, 9);
		expect(m.gainMarginDb).toBeNull(); // phase only approaches −180°
	});

	it('delay: ωc/s·e^(−sTd) has PM 90° − ωcTd, GM at π/(2Td), stable iff ωcTd < π/2', () => {
		// [hand-derivable: the delay margin of an integrator loop is (π/2)/ωc]
		const wc = 1000;
		for (const x of [0.3, 1.2, 1.5, 1.65, 1.9]) {
			const Td = x / wc;
			const m = loopMetrics({ gain: wc, originPower: -1, zeros: [], poles: [], delayS: Td }, { startHz: 1, stopHz: 1e4 });
			expect(m.crossoverHz).toBeCloseTo(hz(wc), 8);
			expect(m.phaseMarginDeg).toBeCloseTo(90 - (x * 180) / Math.PI, 8);
			const w180 = Math.PI / (2 * Td);
			expect(m.phaseCrossovers[0].freqHz).toBeCloseTo(hz(w180), 6);
			expect(m.phaseCrossovers[0].gainMarginDb).toBeCloseTo(20 * Math.log10(w180 / wc), 8);
			expect(m.closedLoopStable).toBe(x < Math.PI / 2);
			if (x < Math.PI / 2) expect(m.delayMarginS).toBeCloseTo((Math.PI / 2 - x) / wc, 12);
			else expect(m.delayMarginS).toBeNull();
		}
	});

	it('modulus margin of the delayed integrator matches a brute-force minimum of |1 + T|', () => {
		// [hand-derivable: |1 + T|² = 1 + u² − 2u·sin(ωTd), u = ωc/ω; brute force on 2·10⁵ points]
		const wc = 1000;
		const Td = 1e-3;
		const m = loopMetrics({ gain: wc, originPower: -1, zeros: [], poles: [], delayS: Td }, { startHz: 1, stopHz: 1e4 });
		let best = Infinity;
		for (let i = 0; i <= 200000; i++) {
			const w = TWO_PI * Math.pow(10, (4 * i) / 200000);
			const u = wc / w;
			best = Math.min(best, Math.sqrt(1 + u * u - 2 * u * Math.sin(w * Td)));
		}
		expect(m.modulusMargin).toBeCloseTo(best, 6);
	});

	it('a RHP zero K(1 − s/ωz)/s is stable iff K < ωz', () => {
		// [hand-derivable: closed-loop pole s = −K/(1 − K/ωz)]
		const wz = 2e4;
		for (const K of [0.5 * wz, 0.9 * wz, 1.1 * wz, 3 * wz]) {
			const m = loopMetrics({ gain: K, originPower: -1, zeros: [realRoot(-wz)], poles: [] }, { startHz: 1, stopHz: 1e7 });
			expect(m.closedLoopStable).toBe(K < wz);
		}
	});
});

describe('several crossings and conditional stability', () => {
	it('K(1 + s)²/s³ is conditionally stable: stable iff K > ½; gain-reduction margin −20·log10(2K)', () => {
		// [hand-derivable: Routh on s³ + K s² + 2K s + K; phase −180° at ω = 1 where |T| = 2K]
		for (const K of [0.3, 0.45, 0.55, 5]) {
			const loop: FactoredTf = { gain: K, originPower: -3, zeros: [realRoot(1), realRoot(1)], poles: [] };
			const m = loopMetrics(loop, { startHz: 1e-4, stopHz: 1e3 });
			expect(m.closedLoopStable).toBe(K > 0.5);
			expect(m.phaseCrossovers.length).toBe(1);
			expect(m.phaseCrossovers[0].freqHz).toBeCloseTo(hz(1), 9);
			expect(m.phaseCrossovers[0].gainMarginDb).toBeCloseTo(-20 * Math.log10(2 * K), 9);
			if (K > 0.5) {
				// the one phase crossing governs (smallest |GM|, python-control's stability_margins convention [from memory]),
				// so the headline GM is negative: the gain may only fall by 20·log10(2K)
				expect(m.gainMarginDb).toBeCloseTo(-20 * Math.log10(2 * K), 9);
				expect(m.gainReductionMarginDb).toBeCloseTo(-20 * Math.log10(2 * K), 9);
				expect(m.phaseMarginDeg!).toBeGreaterThan(0);
			} else {
				expect(m.gainMarginDb).toBeCloseTo(-20 * Math.log10(2 * K), 9);
				expect(m.delayMarginS).toBeNull();
			}
		}
	});

	it('K(1 + s)²/(s³(1 + s/10)²): stability agrees with Routh, and GM / gain-reduction margin give the Routh boundaries', () => {
		// [published: Routh–Hurwitz criterion; the margins must predict where Routh flips]
		const charPoly = (K: number) => [K, 2 * K, K, 1, 0.2, 0.01]; // s³(1 + 0.2s + 0.01s²) + K(1 + s)²
		const tf = (K: number): FactoredTf => ({ gain: K, originPower: -3, zeros: [realRoot(1), realRoot(1)], poles: [realRoot(10), realRoot(10)] });
		for (const K of [0.2, 0.6, 1, 2, 4, 8, 15, 30, 60]) {
			const m = loopMetrics(tf(K), { startHz: 1e-4, stopHz: 1e4 });
			expect(m.closedLoopStable, `K = ${K}`).toBe(routhStable(charPoly(K)));
		}
		const K0 = 4;
		const m = loopMetrics(tf(K0), { startHz: 1e-4, stopHz: 1e4 });
		expect(m.closedLoopStable).toBe(true);
		expect(m.phaseCrossovers.length).toBe(2);
		// the headline GM is whichever of the two is nearer 0 dB; the Routh boundaries need both
		expect(Math.abs(m.gainMarginDb!)).toBe(Math.min(...m.phaseCrossovers.map((p) => Math.abs(p.gainMarginDb))));
		const upper = Math.min(...m.phaseCrossovers.filter((p) => p.gainMarginDb > 0).map((p) => p.gainMarginDb));
		const up = K0 * Math.pow(10, upper / 20);
		const down = K0 * Math.pow(10, m.gainReductionMarginDb! / 20);
		expect(routhStable(charPoly(up * 0.999))).toBe(true);
		expect(routhStable(charPoly(up * 1.001))).toBe(false);
		expect(routhStable(charPoly(down * 1.001))).toBe(true);
		expect(routhStable(charPoly(down * 0.999))).toBe(false);
	});

	it('a resonance poking above 0 dB gives three crossings, each with |T| = 1', () => {
		// [hand-derivable: |ωc/s · H2(s)| at ω0 = ωc·Q/ω0 > 1 adds a rising and a falling crossing]
		const wc = TWO_PI * 1e3;
		const w0 = TWO_PI * 20e3;
		const loop: FactoredTf = { gain: wc, originPower: -1, zeros: [], poles: [pairRoot(w0, 40)] };
		const m = loopMetrics(loop, { startHz: 10, stopHz: 1e6 });
		expect(m.crossovers.map((x) => x.direction)).toEqual(['falling', 'rising', 'falling']);
		for (const x of m.crossovers) expect(Math.abs(evaluatePolar(loop, TWO_PI * x.freqHz).magDb)).toBeLessThan(1e-9);
		// the governing crossing is the one with the smallest |PM| (nearest −1 in angle)
		expect(Math.abs(m.phaseMarginDeg!)).toBe(Math.min(...m.crossovers.map((x) => Math.abs(x.phaseMarginDeg))));
		// closed loop: s·(1 + s/(Qω0) + s²/ω0²) + ωc; Routh decides
		const ch = [wc, 1, 1 / (40 * w0), 1 / (w0 * w0)];
		expect(m.closedLoopStable).toBe(routhStable(ch));
	});

	it('finds a narrow Q = 2000 resonance crossing that a plain 100-per-decade grid would miss', () => {
		// [hand-derivable: peak |T(jω0)| = ωc·Q/ω0 = 2 → two extra crossings within ω0·(1 ± 1/Q)]
		const wc = TWO_PI * 1e3;
		const w0 = TWO_PI * 1e6;
		const m = loopMetrics({ gain: wc, originPower: -1, zeros: [], poles: [pairRoot(w0, 2000)] }, { startHz: 10, stopHz: 1e7 });
		expect(m.crossovers.length).toBe(3);
		expect(Math.abs(m.crossovers[1].freqHz / 1e6 - 1)).toBeLessThan(1e-3);
	});
});

describe('edge cases', () => {
	it('no crossover: |T| below 0 dB everywhere, or above it everywhere, gives null with a reason', () => {
		const low = loopMetrics({ gain: 0.1, originPower: 0, zeros: [], poles: [realRoot(1e3)] }, { startHz: 1, stopHz: 1e6 });
		expect(low.crossoverHz).toBeNull();
		expect(low.phaseMarginDeg).toBeNull();
		expect(low.unavailable.crossoverHz).toMatch(/below 0 dB/);
		expect(low.delayMarginS).toBeNull();
		expect(low.closedLoopStable).toBe(true);
		const high = loopMetrics({ gain: 1e9, originPower: -1, zeros: [], poles: [] }, { startHz: 1, stopHz: 1e6 });
		expect(high.crossoverHz).toBeNull();
		expect(high.unavailable.crossoverHz).toMatch(/above 0 dB/);
	});

	it('a crossing exactly at either edge of the range is found', () => {
		// [hand-derivable: ωc/s crosses at ωc]
		const wc = TWO_PI * 1e3;
		const tf: FactoredTf = { gain: wc, originPower: -1, zeros: [], poles: [] };
		const atStart = loopMetrics(tf, { startHz: 1e3, stopHz: 1e5 });
		expect(atStart.crossovers.length).toBe(1);
		expect(atStart.crossoverHz).toBeCloseTo(1e3, 8);
		const atStop = loopMetrics(tf, { startHz: 1, stopHz: 1e3 });
		expect(atStop.crossovers.length).toBe(1);
		expect(atStop.crossoverHz).toBeCloseTo(1e3, 8);
	});

	it('a phase-crossover line exactly on a grid edge is counted once', () => {
		// −180° exactly at the start for K/s² (phase constant −180° everywhere) → the lines are touched, not crossed
		const m = loopMetrics({ gain: 1e6, originPower: -2, zeros: [], poles: [] }, { startHz: 1, stopHz: 1e6 });
		expect(m.phaseCrossovers.length).toBe(1);
		expect(m.closedLoopStable).toBe(false); // s² + K: poles on the jω axis [hand-derivable]
	});
});
