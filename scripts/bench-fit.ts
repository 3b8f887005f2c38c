/**
 * `npx tsx scripts/bench-fit.ts [repeats]`: the engine's fit (engine/fit, its own bounded
 * soft-L1 Levenberg–Marquardt) against scipy.optimize.least_squares (trf, soft_l1) on the
 * committed cases of reference/fit, both measured in this run: median wall time per fit, the
 * ratio, and the robust cost each reached (equal costs: the same minimum). A measurement, not a test.
 */
import { readFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { fitDesign, type FitResult } from '../src/lib/engine/fit';

const repeats = Number(process.argv[2] ?? 5);
const ref = JSON.parse(readFileSync('reference/fit/out/cases.json', 'utf8'));
const py = spawnSync('python3', ['reference/fit/bench_scipy.py', String(repeats)], { encoding: 'utf8' });
if (py.status !== 0) throw new Error(`python3 failed: ${py.stderr}`);
const scipy = JSON.parse(py.stdout.trim().split('\n').pop()!) as { name: string; ms: number; cost: number; nfev: number }[];
for (const [k, c] of (ref.cases as { name: string; response: 'loop' | 'plant'; fScale: number; parameters: { key: string }[]; measurement: { freqHz: number[]; magDb: number[]; phaseDeg: number[] } }[]).entries()) {
	const parameters = c.parameters.map((p) => {
		const [name, branch] = p.key.split('.');
		return branch === undefined ? { name } : { name, branch: Number(branch) };
	});
	const times: number[] = [];
	let last: FitResult | null = null;
	for (let i = 0; i < repeats; i++) {
		const t0 = performance.now();
		const r = fitDesign({ document: ref.design, measurement: c.measurement, request: { parameters, response: c.response, fScale: c.fScale, maxIterations: 200 }, measuredKind: c.response });
		times.push(performance.now() - t0);
		if ('error' in r) throw new Error(r.error.message);
		last = r;
	}
	times.sort((a, b) => a - b);
	const ms = times[Math.floor(times.length / 2)];
	const s = scipy[k];
	console.log(
		`${c.name}: engine ${ms.toFixed(1)} ms (${last!.evaluations} model evaluations, cost ${last!.residual.after.cost.toExponential(6)}) · scipy ${s.ms.toFixed(1)} ms (${s.nfev} evaluations + its Jacobians, cost ${s.cost.toExponential(6)}) · ratio engine/scipy ${(ms / s.ms).toFixed(2)}`
	);
}
