// sampleParameters: the perturbed part values of a Monte Carlo run, exported for the numpy bench.
// They must be exactly the samples runSpread evaluates, or the bench compares different designs.
import { describe, expect, it } from 'vitest';
import { loopMetrics } from '../../../../src/lib/engine/analysis/margins';
import { buildLoop, loopSpecFromDetail } from '../../../../src/lib/engine/corners/loopModel';
import { runSpread, sampleParameters } from '../../../../src/lib/engine/spread/spread';
import { detail } from '../closedloop/helpers';

const tolerances = {
	l: { tol: 0.2, dist: 'normal' as const },
	c: { tol: 0.2, dist: 'uniform' as const },
	esr: { tol: 0.5, dist: 'uniform' as const },
	dcr: { tol: 0.1, dist: 'normal' as const },
	r2: { tol: 0.01, dist: 'uniform' as const },
	c1: { tol: 0.1, dist: 'normal' as const },
	c3: { tol: 0.1, dist: 'uniform' as const }
};

describe('sampleParameters', () => {
	for (const name of ['buck-ceramic-1v2', 'boost-ceramic-5v-12v']) {
		it(`${name}: the exported samples are the ones runSpread evaluates, sample by sample`, () => {
			const spec = loopSpecFromDetail(detail(name));
			const config = { samples: 150, seed: 2026, tolerances };
			const samples = sampleParameters(spec, config);
			const run = runSpread(spec, config);
			expect(samples).toHaveLength(150);
			for (let i = 0; i < samples.length; i++) {
				const m = loopMetrics(buildLoop(samples[i]).loop, samples[i].rangeHz);
				expect(m.phaseMarginDeg).toBe(run.phaseMarginDeg[i]);
				expect(m.crossoverHz).toBe(run.crossoverHz[i]);
				expect(m.gainMarginDb ?? NaN).toBe(run.gainMarginDb[i]);
				// runSpread takes the verdict-only path; the verdict must be the one the poles give.
				expect(m.closedLoopStable === null ? -1 : m.closedLoopStable ? 1 : 0).toBe(run.stable[i]);
			}
			// Another seed gives other parts.
			const other = sampleParameters(spec, { ...config, seed: 2027 });
			expect(other[0].stage.l).not.toBe(samples[0].stage.l);
		});
	}

	it('stability verdicts equal those from the closed-loop poles when some samples are unstable', () => {
		// A ramp down to 10 % of nominal raises the boost loop gain by up to 20 dB, more than its
		// ≈ 15 dB gain margin, so part of the samples are unstable (gain margin, docs/formulas.md §7.1).
		const spec = loopSpecFromDetail(detail('boost-ceramic-5v-12v'));
		const config = { samples: 120, seed: 11, tolerances: { vramp: { tol: 0.9, dist: 'uniform' as const } } };
		const samples = sampleParameters(spec, config);
		const run = runSpread(spec, config);
		const counts = { stable: 0, unstable: 0 };
		samples.forEach((s, i) => {
			const m = loopMetrics(buildLoop(s).loop, s.rangeHz);
			expect(m.closedLoopStable === null ? -1 : m.closedLoopStable ? 1 : 0).toBe(run.stable[i]);
			if (m.closedLoopStable === true) counts.stable++;
			if (m.closedLoopStable === false) counts.unstable++;
		});
		expect(counts.stable).toBeGreaterThan(0);
		expect(counts.unstable).toBeGreaterThan(0);
	});

	it('varies only the toleranced parts, each within its limit', () => {
		const spec = loopSpecFromDetail(detail('buck-ceramic-1v2'));
		const samples = sampleParameters(spec, { samples: 400, seed: 5, tolerances });
		const within = (x: number, nominal: number, tol: number) => Math.abs(x / nominal - 1) <= tol * (1 + 1e-12);
		const p0 = spec.parts as unknown as Record<string, number>;
		let lMoved = 0;
		for (const s of samples) {
			const p = s.parts as unknown as Record<string, number>;
			expect(within(s.stage.l, spec.stage.l, 0.2)).toBe(true);
			expect(within(s.stage.capacitors[0].c, spec.stage.capacitors[0].c, 0.2)).toBe(true);
			expect(within(s.stage.capacitors[0].esr, spec.stage.capacitors[0].esr, 0.5)).toBe(true);
			expect(within(s.stage.dcr, spec.stage.dcr, 0.1)).toBe(true);
			expect(within(p.r2, p0.r2, 0.01)).toBe(true);
			expect(within(p.c1, p0.c1, 0.1)).toBe(true);
			expect(within(p.c3, p0.c3, 0.1)).toBe(true);
			// No tolerance given: exactly as built.
			expect([p.r1, p.r3, p.c2, s.stage.rdsOn, s.stage.vin, s.modulator.vramp]).toEqual([p0.r1, p0.r3, p0.c2, spec.stage.rdsOn, spec.stage.vin, spec.modulator.vramp]);
			if (s.stage.l !== spec.stage.l) lMoved++;
		}
		expect(lMoved).toBe(400);
	});
});
