// Nightly-sized property run: every property test under tests/unit/property with 10 000 cases
// each (npm test runs them with a few hundred), then the HTTP properties of the analysis API.
// Usage: npx tsx scripts/property-nightly.ts [runs]   (PROPERTY_SEED=<n> replays a failure)
import { spawnSync } from 'node:child_process';

const runs = Number(process.argv[2] ?? 10_000);
if (!Number.isInteger(runs) || runs < 1) {
	console.error('usage: npx tsx scripts/property-nightly.ts [runs]');
	process.exit(2);
}

function vitest(label: string, args: string[], env: Record<string, string>): boolean {
	console.log(`\n[property-nightly] ${label}`);
	const started = Date.now();
	const r = spawnSync('npx', ['vitest', 'run', ...args], { stdio: 'inherit', env: { ...process.env, ...env } });
	console.log(`[property-nightly] ${label}: ${r.status === 0 ? 'passed' : 'FAILED'} in ${((Date.now() - started) / 1000).toFixed(0)} s`);
	return r.status === 0;
}

// The HTTP properties send one request per case; a tenth of the cases keeps them within minutes.
const unit = vitest(`unit properties, ${runs} cases each`, ['--project', 'unit', 'tests/unit/property'], { PROPERTY_RUNS: String(runs) });
const http = vitest(`HTTP properties, ${Math.ceil(runs / 10)} cases each`, ['--project', 'integration', 'tests/integration/security/analyze-invalid.test.ts'], {
	PROPERTY_RUNS: String(Math.ceil(runs / 10))
});
process.exit(unit && http ? 0 : 1);
