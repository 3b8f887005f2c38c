import { describe, expect, it } from 'vitest';
import { analyzeInputFilter } from '../../../../src/lib/engine/inputfilter/analyzeInputFilter';
import {
	filterCorrection,
	filterFeatures,
	filterOutputImpedance,
	optimalDamping,
	peakImpedance
} from '../../../../src/lib/engine/inputfilter/filter';
import { inputFilterSchema } from '../../../../src/lib/engine/inputfilter/schema';
import { evaluate } from '../../../../src/lib/engine/tf/evaluate';
import { detail } from '../closedloop/helpers';

const LF = 1e-6;
const CF = 10e-6;
const R0 = Math.sqrt(LF / CF);

describe('optimum damping (Erickson 1999)', () => {
	// [published: Erickson, "Optimal Single Resistor Damping of Input Filters", APEC 1999; values: formula sheet §9]
	const table: [number, number, number][] = [
		[1, 1.44914, 2.44949],
		[2, 0.91287, 1.41421],
		[4, 0.61237, 0.86603],
		[8, 0.42696, 0.55902]
	];
	for (const [n, q, peak] of table) {
		it(`n = ${n}: Qopt ${q}, peak |Zs|/R0f ${peak}, and no other Rd gives a lower peak`, () => {
			const o = optimalDamping(LF, CF, n);
			expect(o.qOpt).toBeCloseTo(q, 5);
			expect(o.peakZs / R0).toBeCloseTo(peak, 5);
			expect(o.cd).toBeCloseTo(n * CF, 18);
			// The peak of the filter's own |Zs| (lossless Lf) equals the formula, and is a minimum over Rd.
			const at = (rd: number) => peakImpedance(filterOutputImpedance({ l: LF, c: CF, damping: { rd, cd: n * CF } }), 1e3, 1e6).peak;
			expect(at(o.rd) / R0).toBeCloseTo(peak, 5);
			expect(at(o.rd * 1.1)).toBeGreaterThan(at(o.rd));
			expect(at(o.rd / 1.1)).toBeGreaterThan(at(o.rd));
		});
	}
});

describe('filter output impedance: the formula sheet §9 example', () => {
	// [formula sheet §9: Lf = 1 µH, Cf = 10 µF (from R0f = 0.31623 Ω, f0 = 50.33 kHz); rf = 5 mΩ inferred from the
	// undamped peak 19.98 Ω ≈ R0f²/rf — so that check is to 0.5 %]
	it('R0f and f0', () => {
		const f = filterFeatures({ l: LF, c: CF });
		expect(f.r0).toBeCloseTo(0.31623, 5);
		expect(f.f0Hz / 1e3).toBeCloseTo(50.33, 2);
	});
	it('undamped peak 19.98 Ω at 50.35 kHz', () => {
		const p = peakImpedance(filterOutputImpedance({ l: LF, dcr: 0.005, c: CF, damping: null }), 1e3, 1e6);
		expect(Math.abs(p.peak / 19.98 - 1)).toBeLessThan(5e-3);
		expect(Math.abs(p.freqHz / 50.35e3 - 1)).toBeLessThan(1e-3);
	});
	it('damped (n = 4, Rd = 0.19365 Ω, Cd = 40 µF): peak 0.2638 Ω at 29.4 kHz', () => {
		const p = peakImpedance(filterOutputImpedance({ l: LF, dcr: 0.005, c: CF, damping: { rd: 0.19365, cd: 40e-6 } }), 1e3, 1e6);
		expect(p.peak).toBeCloseTo(0.2638, 4);
		expect(Math.abs(p.freqHz / 29.4e3 - 1)).toBeLessThan(5e-3);
	});
});

describe('loop gain with the filter', () => {
	for (const name of ['buck-ceramic-1v2', 'boost-ceramic-5v-12v']) {
		it(`${name}: the factored correction equals (1 + Zs/ZN)/(1 + Zs/ZD) [published: Middlebrook 1976; E&M ch. 10]`, () => {
			const det = detail(name);
			const zs = filterOutputImpedance({ l: LF, dcr: 0.005, c: CF, damping: { rd: 0.2, cd: 40e-6 } });
			const f = filterCorrection(zs, det.plant.zn, det.plant.zd);
			for (const hz of [10, 1e3, 2e4, 5e4, 3e5]) {
				const w = 2 * Math.PI * hz;
				const a = evaluate(zs, w);
				const one = (z: { re: number; im: number }) => {
					const q = div(a, z);
					return { re: 1 + q.re, im: q.im };
				};
				const want = div(one(evaluate(det.plant.zn, w)), one(evaluate(det.plant.zd, w)));
				const got = evaluate(f, w);
				expect(Math.hypot(got.re - want.re, got.im - want.im) / Math.hypot(want.re, want.im), `${name} at ${hz} Hz`).toBeLessThan(1e-9);
			}
		});
		it(`${name}: a well-damped filter passes Middlebrook and barely moves the margins; the undamped one fails`, () => {
			const det = detail(name);
			const range = det.response.metrics.analysedRangeHz;
			const grid = det.response.response.freqHz;
			const ok = analyzeInputFilter({ l: LF, dcr: 0.005, c: CF, damping: { optimalRatio: 4 } }, det.plant, det.loop, grid, range);
			expect(ok.middlebrook.pass).toBe(true);
			expect(ok.verdict.code).toBe('pass');
			// Boost: the RHP zero of Gvd and the RHP root of ZN cancel exactly, so no spurious unstable pole appears.
			expect(ok.withFilter.closedLoopStable).toBe(true);
			// Middlebrook's criterion met: the loop gain is changed little [published: Middlebrook 1976]
			expect(Math.abs(ok.withFilter.phaseMarginDeg! - ok.withoutFilter.phaseMarginDeg!)).toBeLessThan(6);
			const bad = analyzeInputFilter({ l: LF, dcr: 0.005, c: CF, damping: null }, det.plant, det.loop, grid, range);
			expect(bad.middlebrook.pass).toBe(false);
			expect(bad.verdict.code).toBe('fail');
			expect(Math.abs(bad.middlebrook.marginNHz / 50.3e3 - 1)).toBeLessThan(0.05);
		});
	}
});

describe('input filter schema', () => {
	it('accepts parts, an optimum ratio or none, and names bad fields', () => {
		expect(inputFilterSchema.parse({ l: 1e-6, c: 1e-5 })).toMatchObject({ dcr: 0, damping: null, marginDb: 6 });
		expect(inputFilterSchema.parse({ l: 1e-6, c: 1e-5, damping: { optimalRatio: 4 } }).damping).toEqual({ optimalRatio: 4 });
		const bad = inputFilterSchema.safeParse({ l: -1, c: 1e-5 });
		expect(bad.success).toBe(false);
		expect(bad.error!.issues[0].path).toEqual(['l']);
	});
});

function div(a: { re: number; im: number }, b: { re: number; im: number }) {
	const d = b.re * b.re + b.im * b.im;
	return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
