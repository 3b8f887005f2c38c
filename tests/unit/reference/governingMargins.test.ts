/**
 * The governing-margin rule against an independent reference: reference/margins/generate.py builds
 * random loops with several gain crossings, conditional boosts (a phase crossing while |T| > 1),
 * resonances above 0 dB, RHP zeros and delays, evaluates T(jω) with plain numpy on a dense grid
 * (4000 points per decade, numerical unwrap) and applies python-control's `stability_margins`
 * convention [from memory]: headline PM = the gain crossing with the smallest |PM|, headline GM =
 * the phase crossing with the smallest |GM dB|. Regenerate: `python3 reference/margins/generate.py`.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loopMetrics } from '../../../src/lib/engine/analysis/margins';
import type { FactoredTf } from '../../../src/lib/engine/tf/types';

interface RefCase {
	family: number;
	loop: FactoredTf & { delayS: number };
	rangeHz: { startHz: number; stopHz: number };
	crossovers: { freqHz: number; phaseMarginDeg: number }[];
	phaseCrossovers: { freqHz: number; gainMarginDb: number }[];
	/** Below this the reference's dense grid resolves the phase (a long delay turns it too fast above). */
	phaseResolvedToHz: number;
	crossoverHz: number;
	phaseMarginDeg: number;
	gainMarginDb: number | null;
	phaseCrossoverHz: number | null;
}

const file = path.resolve(__dirname, '../../../reference/margins/out/cases.json');
const ref = JSON.parse(readFileSync(file, 'utf8')) as { cases: RefCase[] };

// Both sides refine each crossing to near machine precision (bisection there, bracketed Newton
// here); the tolerances leave room for the last digits of ln|T| and the phase only.
const REL_HZ = 1e-7;
const DEG = 1e-4;
const DB = 1e-4;

describe('governing margins against the numpy reference (reference/margins)', () => {
	it('holds enough hard cases: several crossings, conditional stability, delays, and cases the old rule got wrong', () => {
		expect(ref.cases.length).toBeGreaterThanOrEqual(50);
		expect(new Set(ref.cases.map((c) => c.family)).size).toBe(5);
		expect(ref.cases.filter((c) => c.crossovers.length >= 3).length).toBeGreaterThan(10);
		expect(ref.cases.filter((c) => c.loop.delayS > 0).length).toBeGreaterThan(10);
		// the smallest signed PM (the rule before the governing-margin rule) differs from the smallest |PM| in these
		const oldRuleDiffers = ref.cases.filter((c) => Math.min(...c.crossovers.map((x) => x.phaseMarginDeg)) !== c.phaseMarginDeg);
		expect(oldRuleDiffers.length).toBeGreaterThanOrEqual(5);
	});

	ref.cases.forEach((c, i) => {
		it(`case ${i} (family ${c.family}, ${c.crossovers.length} gain crossings)`, () => {
			const m = loopMetrics(c.loop, c.rangeHz);
			expect(m.crossovers.length).toBe(c.crossovers.length);
			m.crossovers.forEach((x, j) => {
				expect(Math.abs(x.freqHz / c.crossovers[j].freqHz - 1), `crossing ${j} frequency`).toBeLessThan(REL_HZ);
				expect(Math.abs(x.phaseMarginDeg - c.crossovers[j].phaseMarginDeg), `crossing ${j} PM`).toBeLessThan(DEG);
			});
			expect(Math.abs(m.crossoverHz! / c.crossoverHz - 1)).toBeLessThan(REL_HZ);
			expect(Math.abs(m.phaseMarginDeg! - c.phaseMarginDeg)).toBeLessThan(DEG);
			// phase crossings inside the range and below where the reference's grid resolves the phase
			const top = Math.min(c.rangeHz.stopHz, c.phaseResolvedToHz) / 2;
			const inside = (f: number) => f > 2 * c.rangeHz.startHz && f < top;
			const mine = m.phaseCrossovers.filter((p) => inside(p.freqHz));
			const theirs = c.phaseCrossovers.filter((p) => inside(p.freqHz));
			expect(mine.length).toBe(theirs.length);
			mine.forEach((p, j) => {
				expect(Math.abs(p.freqHz / theirs[j].freqHz - 1), `phase crossing ${j} frequency`).toBeLessThan(REL_HZ);
				expect(Math.abs(p.gainMarginDb - theirs[j].gainMarginDb), `phase crossing ${j} GM`).toBeLessThan(DB);
			});
			if (c.gainMarginDb === null) expect(m.gainMarginDb).toBeNull();
			else {
				expect(Math.abs(m.gainMarginDb! - c.gainMarginDb)).toBeLessThan(DB);
				expect(Math.abs(m.phaseCrossoverHz! / c.phaseCrossoverHz! - 1)).toBeLessThan(REL_HZ);
			}
		});
	});
});
