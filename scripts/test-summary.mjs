// Reads the vitest and Playwright JSON reports and prints the one closing line CI reads:
// "N passed, N failed" (", N skipped" when any). svelte-check counts as one check.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const [dir, checkStatus] = process.argv.slice(2);
let passed = 0;
let failed = 0;
let skipped = 0;

const vitestFile = join(dir, 'vitest.json');
if (existsSync(vitestFile)) {
	const v = JSON.parse(readFileSync(vitestFile, 'utf8'));
	passed += v.numPassedTests ?? 0;
	failed += v.numFailedTests ?? 0;
	// A file that failed to load has no failed test of its own; count it once. (numFailedTestSuites
	// counts describe blocks too, so it would count a failing test twice.)
	for (const file of v.testResults ?? [])
		if (file.status === 'failed' && !(file.assertionResults ?? []).some((a) => a.status === 'failed')) failed += 1;
	skipped += (v.numPendingTests ?? 0) + (v.numTodoTests ?? 0);
} else failed += 1;

const e2eFile = join(dir, 'e2e.json');
if (existsSync(e2eFile)) {
	const e = JSON.parse(readFileSync(e2eFile, 'utf8'));
	passed += e.stats?.expected ?? 0;
	failed += (e.stats?.unexpected ?? 0) + (e.stats?.flaky ?? 0) + (e.errors?.length ?? 0);
	skipped += e.stats?.skipped ?? 0;
} else failed += 1;

if (checkStatus === '0') passed += 1;
else failed += 1;

console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed > 0 ? 1 : 0);
