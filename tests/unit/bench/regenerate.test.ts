// Re-runs reference/bench/generate.py into a temporary folder and diffs with the committed fixtures (only where
// python3 with numpy and scipy is installed).
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const hasScipy = spawnSync('python3', ['-c', 'import numpy, scipy'], { stdio: 'ignore' }).status === 0;
const FIXTURES = path.resolve('tests/unit/bench/fixtures');

describe.runIf(hasScipy)('bench fixtures regenerate', () => {
	it('same files, same margins', { timeout: 60_000 }, () => {
		const out = mkdtempSync(path.join(tmpdir(), 'loopwright-bench-'));
		try {
			const r = spawnSync('python3', ['reference/bench/generate.py', '--out', out], { encoding: 'utf8' });
			expect(r.status, r.stderr).toBe(0);
			for (const name of readdirSync(FIXTURES).filter((f) => f !== 'expected.json')) {
				expect(readFileSync(path.join(out, name), 'utf8'), name).toBe(readFileSync(path.join(FIXTURES, name), 'utf8'));
			}
			const a = JSON.parse(readFileSync(path.join(out, 'expected.json'), 'utf8')).files;
			const b = JSON.parse(readFileSync(path.join(FIXTURES, 'expected.json'), 'utf8')).files;
			for (const name of Object.keys(b)) {
				const pm = (x: { phaseMarginDeg?: number | null }) => x.phaseMarginDeg ?? 0;
				expect(Math.abs(pm(a[name]) - pm(b[name])), name).toBeLessThan(1e-6);
				expect(a[name].points, name).toBe(b[name].points);
			}
		} finally {
			rmSync(out, { recursive: true, force: true });
		}
	});
});
