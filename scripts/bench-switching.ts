/**
 * `npm run bench` (last part): the switching check (engine switching/) of the two voltage-mode
 * designs in reference/switching/cases and a peak current-mode boost of reference/currentmode/cases,
 * about ten frequencies each plus the linearity point, against
 * reference/bench_switching_numpy.py, the same method in numpy/scipy (scipy.linalg.expm per
 * interval), given the same switched systems and the same (N, amplitude) list in the same run.
 * Prints process CPU time per check for both, their ratio and the largest difference in T.
 * A benchmark, never a test: nothing here asserts a time.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { analyzeDesignDetailed } from '../src/lib/engine/analyze';
import { switchingCheckInputOf } from '../src/lib/engine/pipeline/switchingCircuit';
import { initialGuess, switchingCheck, type SwitchingCheckResult } from '../src/lib/engine/switching/check';
import { switchedSystem } from '../src/lib/engine/switching/circuit';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const RUNS = Math.max(1, Number(process.env.BENCH_RUNS ?? 3));
const CASES = [
	['switching', 'buck-12v-3v3'],
	['switching', 'boost-5v-12v-light'],
	['currentmode', 'boost-d058-rhp']
] as const;

const cpuMs = () => {
	const u = process.cpuUsage();
	return (u.user + u.system) / 1000;
};
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const plain = (s: ReturnType<typeof switchedSystem>) => ({
	n: s.n,
	nc: s.nc,
	aOn: Array.from(s.aOn),
	aOff: Array.from(s.aOff),
	control: Array.from(s.control),
	voutOn: Array.from(s.voutOn),
	voutOff: Array.from(s.voutOff)
});

const jobs = [];
const engine: { name: string; cpuMs: number; wallMs: number; result: SwitchingCheckResult }[] = [];
for (const [dir, name] of CASES) {
	const doc = JSON.parse(readFileSync(path.join(ROOT, 'reference', dir, 'cases', `${name}.json`), 'utf8'));
	const detail = analyzeDesignDetailed(doc, { includeResponse: false });
	if ('error' in detail) throw new Error(`${name}: ${detail.error.message}`);
	const input = switchingCheckInputOf(detail);
	switchingCheck(input); // warm the JIT once
	const cpu: number[] = [];
	const wall: number[] = [];
	let result: SwitchingCheckResult | null = null;
	for (let r = 0; r < RUNS; r++) {
		const c0 = cpuMs();
		const w0 = performance.now();
		result = switchingCheck(input);
		wall.push(performance.now() - w0);
		cpu.push(cpuMs() - c0);
	}
	engine.push({ name, cpuMs: median(cpu), wallMs: median(wall), result: result! });
	const c = input.circuit;
	const unperturbed = switchedSystem(c, { omega: 0, amplitude: 0 });
	const list = result!.points.map((p) => ({ periods: p.periods, amplitude: p.amplitude }));
	const near = result!.points.find((p) => p.freqHz === result!.linearity?.freqHz);
	if (near) list.push({ periods: near.periods, amplitude: near.amplitude / 2 });
	jobs.push({
		name,
		fsw: c.fswHz,
		rampSlope: unperturbed.comparator.rampSlope,
		marginScale: unperturbed.comparator.scale,
		unperturbed: plain(unperturbed),
		guess: Array.from(initialGuess(input, unperturbed.names, unperturbed.n)),
		measurements: list.map((m) => ({ ...m, system: plain(switchedSystem(c, { omega: (2 * Math.PI * c.fswHz) / m.periods, amplitude: m.amplitude })) }))
	});
}

const py = spawnSync('python3', [path.join(ROOT, 'reference/bench_switching_numpy.py')], { input: JSON.stringify({ cases: jobs }), maxBuffer: 1 << 26 });
if (py.status !== 0) throw new Error(`numpy reference failed: ${py.stderr}`);
const ref = JSON.parse(py.stdout.toString()) as { numpy: string; cases: { name: string; cpuS: number; points: { periods: number; re: number; im: number }[] }[] };

console.log(`switching check (engine switching/ vs numpy ${ref.numpy}/scipy, same method, same systems; median of ${RUNS})`);
for (const e of engine) {
	const r = ref.cases.find((c) => c.name === e.name)!;
	let dDb = 0;
	let dDeg = 0;
	for (const p of e.result.points) {
		const q = r.points.find((x) => x.periods === p.periods)!;
		dDb = Math.max(dDb, Math.abs(p.magDb - 20 * Math.log10(Math.hypot(q.re, q.im))));
		const d = p.phaseDeg - (Math.atan2(q.im, q.re) * 180) / Math.PI;
		dDeg = Math.max(dDeg, Math.abs(d - 360 * Math.round(d / 360)));
	}
	const measured = e.result.points.length + (e.result.linearity ? 1 : 0);
	console.log(
		`  ${e.name}: ${measured} measurements; engine ${(e.cpuMs / 1000).toFixed(2)} s CPU (${(e.wallMs / 1000).toFixed(2)} s wall), numpy ${r.cpuS.toFixed(2)} s CPU, ratio numpy/engine ${(r.cpuS * 1000 / e.cpuMs).toFixed(1)}×; largest difference ${dDb.toExponential(1)} dB, ${dDeg.toExponential(1)}°`
	);
}
