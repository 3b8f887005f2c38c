// Load and reference steps of banks with six to eight ESL branches: these gave
// "non-finite output" before the residues were formed without overflow (modal.ts). Each case is
// checked against scipy.signal.lsim / scipy.signal.step on the closed loop built in state space
// from the averaged circuit equations (reference/closedloop/generate.py run on reference/banks/cases;
// no engine code involved).
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesignDetailed, type AnalysisDetail } from '../../../../src/lib/engine/analyze';
import { analyzeClosedLoop } from '../../../../src/lib/engine/closedloop/analyzeClosedLoop';
import { closedLoopInputOf } from '../../../../src/lib/engine/closedloop/sections';
import { ROOT } from '../closedloop/helpers';

const DIR = join(ROOT, 'reference', 'banks');
const NAMES = readdirSync(join(DIR, 'cases'))
	.filter((f) => f.endsWith('.json'))
	.map((f) => f.replace(/\.json$/, ''))
	.sort();
const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('many-branch ESL banks: load and reference steps against scipy', () => {
	it('has the three committed cases', () => expect(NAMES.length).toBe(3));
	for (const name of NAMES) {
		const doc = JSON.parse(readFileSync(join(DIR, 'cases', `${name}.json`), 'utf8'));
		const ref = JSON.parse(readFileSync(join(DIR, 'out', `${name}.json`), 'utf8')).scipy;
		it(`${name}: answers (no warning), peak, peak time and 2 % settling within 0.2 % of scipy lsim`, () => {
			const det = analyzeDesignDetailed(doc) as AnalysisDetail;
			expect('error' in det).toBe(false);
			const spec = ref.loadStep;
			const cl = analyzeClosedLoop(
				closedLoopInputOf(det, det.response.response.freqHz, { step: spec.step, riseTime: spec.riseTime, referenceStep: ref.referenceStep.step })
			);
			expect(cl.stable).toBe(true);
			expect(cl.warnings.map((w) => w.code)).not.toContain('transient-unavailable');
			const ls = cl.loadStep!;
			// [scipy: signal.lsim of the closed-loop state space from the circuit, reference/banks/README.md]
			expect(rel(ls.figures.peakDeviation, spec.peakDeviation), 'peak').toBeLessThan(2e-3);
			expect(rel(ls.figures.peakTimeS, spec.peakTimeS), 'peak time').toBeLessThan(5e-3);
			expect(rel(ls.figures.settlingTimeS!, spec.settlingTimeS), 'settling').toBeLessThan(5e-3);
			// [scipy: signal.step of (1/H)·T/(1 + T) in the same state space]
			const r = cl.referenceStep!;
			expect(rel(r.figures.peakDeviation, ref.referenceStep.peakDeviation), 'reference peak').toBeLessThan(2e-3);
			expect(rel(r.figures.finalValue, ref.referenceStep.finalValue), 'reference final').toBeLessThan(1e-6);
			expect(rel(r.figures.settlingTimeS!, ref.referenceStep.settlingTimeS), 'reference settling').toBeLessThan(5e-3);
		});
	}
});
