import { describe, expect, it } from 'vitest';
import { loopSpecFromDetail } from '../../../../src/lib/engine/corners/loopModel';
import { partsPresent } from '../../../../src/lib/engine/corners/variation';
import { histogram, percentile, statistics } from '../../../../src/lib/engine/spread/histogram';
import { createRng } from '../../../../src/lib/engine/spread/prng';
import { createSpreadRun, runSpread, runSpreadChunked, sampleVariation } from '../../../../src/lib/engine/spread/spread';
import { spreadSchema } from '../../../../src/lib/engine/spread/schema';
import { detail } from '../closedloop/helpers';

const spec = loopSpecFromDetail(detail('buck-ceramic-1v2'));
const tolerances = {
	l: { tol: 0.2, dist: 'uniform' as const },
	c: { tol: 0.2, dist: 'normal' as const },
	r2: { tol: 0.01, dist: 'normal' as const },
	c1: { tol: 0.1, dist: 'uniform' as const }
};

describe('Monte Carlo spread', () => {
	it('reproduces exactly for the same seed, whatever the chunking', async () => {
		const a = runSpread(spec, { samples: 120, seed: 42, tolerances });
		const b = await runSpreadChunked(spec, { samples: 120, seed: 42, tolerances }, { chunkSize: 7, yieldFn: async () => {} });
		expect(Array.from(b.phaseMarginDeg)).toEqual(Array.from(a.phaseMarginDeg));
		expect(Array.from(b.crossoverHz)).toEqual(Array.from(a.crossoverHz));
		const c = runSpread(spec, { samples: 120, seed: 43, tolerances });
		expect(Array.from(c.phaseMarginDeg)).not.toEqual(Array.from(a.phaseMarginDeg));
	});

	it('with zero tolerance every sample is the nominal design', () => {
		const r = runSpread(spec, { samples: 5, seed: 1, tolerances: { l: { tol: 0, dist: 'uniform' } }, targets: { phaseMarginDeg: 50 } });
		const pm = r.phaseMarginDeg[0];
		for (const x of r.phaseMarginDeg) expect(x).toBe(pm);
		// nominal PM ≈ 56.4° meets a 50° target and misses a 60° one
		expect(r.yield.all).toBe(1);
		expect(runSpread(spec, { samples: 3, tolerances: {}, targets: { phaseMarginDeg: 60 } }).yield.all).toBe(0);
	});

	it('reports progress, can be cancelled, and keeps what it has', async () => {
		const seen: number[] = [];
		const signal = { aborted: false };
		const r = await runSpreadChunked(spec, { samples: 1000, tolerances }, {
			chunkSize: 10,
			yieldFn: async () => {},
			onProgress: (done) => {
				seen.push(done);
				if (done >= 30) signal.aborted = true;
			},
			signal
		});
		expect(r.cancelled).toBe(true);
		expect(r.completed).toBe(30);
		expect(seen).toEqual([10, 20, 30, 30]);
		expect(r.histograms.phaseMarginDeg.counts.reduce((a, b) => a + b, 0)).toBe(30);
	});

	it('draws uniform tolerances with variance tol²/3 and truncated normals inside ±tol [statistics of the uniform law]', () => {
		const rng = createRng(9);
		const present = new Set(partsPresent(spec));
		const l: number[] = [];
		const c: number[] = [];
		for (let i = 0; i < 20000; i++) {
			const v = sampleVariation(rng, spec, tolerances, present);
			l.push(v.factors!.l! - 1);
			c.push(v.branchFactors!.c![0] - 1);
		}
		const s = statistics(l);
		expect(Math.abs(s.mean!)).toBeLessThan(0.004);
		expect(s.std! ** 2 / (0.2 ** 2 / 3)).toBeCloseTo(1, 1);
		expect(Math.max(...c.map(Math.abs))).toBeLessThanOrEqual(0.2);
		// σ of a normal truncated at ±3σ is 0.9866·σ [published: truncated normal variance, from memory]
		expect(statistics(c).std! / (0.2 / 3)).toBeCloseTo(0.9866, 1);
	});

	it('rejects a sample count outside 1…10000', () => {
		expect(() => createSpreadRun(spec, { samples: 10001, tolerances })).toThrow(/1…10000/);
		const p = spreadSchema.safeParse({ samples: 0 });
		expect(p.success).toBe(false);
		expect(p.error!.issues[0].path).toEqual(['samples']);
		expect(spreadSchema.parse({})).toMatchObject({ samples: 1000, seed: 1, bins: 40 });
	});
});

describe('histogram and percentiles', () => {
	it('percentiles follow numpy.percentile (linear, the default) [numpy: np.percentile(np.arange(1, 11), [5, 50, 95]) = 1.45, 5.5, 9.55]', () => {
		const v = Float64Array.from({ length: 10 }, (_, i) => i + 1);
		expect(percentile(v, 0.05)).toBeCloseTo(1.45, 12);
		expect(percentile(v, 0.5)).toBeCloseTo(5.5, 12);
		expect(percentile(v, 0.95)).toBeCloseTo(9.55, 12);
	});
	it('counts every finite value once and the rest as missing', () => {
		const h = histogram([1, 2, 3, NaN, 10, 100], 4, 'log');
		expect(h.counts.reduce((a, b) => a + b, 0)).toBe(5);
		expect(h.missing).toBe(1);
		expect(h.edges[0]).toBeCloseTo(1, 12);
		expect(h.edges[4]).toBeCloseTo(100, 9);
		// edges 1, 3.16, 10, 31.6, 100 [hand-derived]: 1, 2, 3 | — | 10 | 100
		expect(h.counts).toEqual([3, 0, 1, 1]);
	});
});
