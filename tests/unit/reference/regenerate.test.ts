/**
 * Re-runs the reference generators (reference/scipy/generate.py, reference/ngspice/generate.py)
 * into a temporary folder and diffs the result with the committed JSON, so the committed numbers
 * are known to come from the committed scripts. Runs only where python3 with numpy and scipy
 * (and, for the second block, ngspice) is installed.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { REFERENCE_DIR, caseNames, loadOutput, worstDeviation } from './referenceData';

const hasPythonScipy = spawnSync('python3', ['-c', 'import numpy, scipy'], { stdio: 'ignore' }).status === 0;
const hasNgspice = spawnSync('ngspice', ['-v'], { stdio: 'ignore' }).status === 0;

// Tight: the same scripts on another numpy/scipy/ngspice build may move only the last digits.
const MAG_TOL_DB = 1e-6;
const PHASE_TOL_DEG = 1e-5;

function regenerate(tool: 'scipy' | 'ngspice'): string {
	const out = mkdtempSync(path.join(tmpdir(), `loopwright-${tool}-`));
	const args = [path.join(REFERENCE_DIR, tool, 'generate.py'), '--out', out];
	if (tool === 'ngspice') args.push('--netlists', path.join(out, 'netlists'));
	const run = spawnSync('python3', args, { encoding: 'utf8', timeout: 60_000 });
	if (run.status !== 0) throw new Error(`${tool} generator failed (status ${run.status}):\n${run.stderr}`);
	return out;
}

function diffAgainstCommitted(tool: 'scipy' | 'ngspice', out: string) {
	for (const name of caseNames()) {
		const committed = loadOutput(tool, name);
		const fresh = loadOutput(tool, name, out);
		expect(fresh.freqHz.length, `${tool} ${name}: number of points`).toBe(committed.freqHz.length);
		fresh.freqHz.forEach((f, i) => expect(Math.abs(f / committed.freqHz[i] - 1), `${tool} ${name}: freqHz[${i}]`).toBeLessThan(1e-12));
		expect(fresh.operatingPoint.duty, `${tool} ${name}: duty`).toBeCloseTo(committed.operatingPoint.duty, 12);
		expect(Object.keys(fresh.responses).sort(), `${tool} ${name}: responses`).toEqual(Object.keys(committed.responses).sort());
		for (const [key, bode] of Object.entries(committed.responses)) {
			const dev = worstDeviation(committed.freqHz, bode, fresh.responses[key]);
			expect(dev.magDb.value, `${tool} ${name} ${key}: magnitude at index ${dev.magDb.index} (${dev.magDb.freqHz} Hz)`).toBeLessThanOrEqual(MAG_TOL_DB);
			expect(dev.phaseDeg.value, `${tool} ${name} ${key}: phase at index ${dev.phaseDeg.index} (${dev.phaseDeg.freqHz} Hz)`).toBeLessThanOrEqual(PHASE_TOL_DEG);
		}
		if (committed.metrics) {
			expect(fresh.metrics?.crossovers.length, `${tool} ${name}: crossover count`).toBe(committed.metrics.crossovers.length);
			expect(fresh.metrics?.phaseMarginDeg, `${tool} ${name}: phase margin`).toBeCloseTo(committed.metrics.phaseMarginDeg!, 6);
		}
	}
}

const made: string[] = [];
afterAll(() => made.forEach((dir) => rmSync(dir, { recursive: true, force: true })));

describe.runIf(hasPythonScipy)('scipy reference regenerates to the committed JSON', () => {
	it('re-runs reference/scipy/generate.py and diffs every case', () => {
		const out = regenerate('scipy');
		made.push(out);
		diffAgainstCommitted('scipy', out);
	}, 60_000);
});

describe.runIf(hasPythonScipy && hasNgspice)('ngspice reference regenerates to the committed JSON', () => {
	it('re-runs reference/ngspice/generate.py and diffs every case', () => {
		const out = regenerate('ngspice');
		made.push(out);
		diffAgainstCommitted('ngspice', out);
	}, 60_000);
});
