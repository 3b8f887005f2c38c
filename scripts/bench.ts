/**
 * `npm run bench`: full loop metrics for 10 000 random buck and boost designs with the engine
 * (analyzeDesign with includeResponse: false: every metric and the closed-loop poles, no Bode
 * arrays), then reference/bench_numpy.py (a dense 500-point numpy sweep with sign-change search,
 * what an engineer would write instead) on the same designs, exchanged through a temporary JSON
 * file. Engine and numpy alternate for BENCH_RUNS rounds [3]; it prints each round and the
 * medians: ms per design for both (process CPU time, and wall time), their ratio and the largest
 * phase-margin difference.
 * A benchmark, never a test: nothing here asserts a time.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { fileURLToPath } from 'node:url';
import { analyzeDesign } from '../src/lib/engine';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const COUNT = Number(process.env.BENCH_COUNT ?? 10_000);
const SEED = Number(process.env.BENCH_SEED ?? 20261201);
const RUNS = Math.max(1, Math.floor(Number(process.env.BENCH_RUNS ?? 3)));
const SWEEP_POINTS = 500;
// "Full metrics" = every field of the response's `metrics` (crossings, margins, closed-loop
// poles) and the operating point; the Bode arrays are a plotting concern and are left out.
const OPTIONS = { includeResponse: false } as const;
// One untimed pass over the designs before the first round, so the JIT has reached its
// optimising tier on the hot paths (it takes ~10 000 designs: with 200 or 2000 warm-up designs
// the first round ran 40-50 % slower than the later ones). numpy has no JIT to warm.
const WARMUP_PASSES = Number(process.env.BENCH_WARMUP ?? 1);

// Design documents are plain contract JSON here; the engine validates them.
type Doc = Record<string, any>;

/** mulberry32: small, seeded, good enough to spread tolerances. */
function rng(seed: number) {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = Math.imul(a ^ (a >>> 15), 1 | a);
		t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/**
 * Two families, each a nominal reference case with a fixed Type III compensator given by parts
 * (reference/cases), spread uniformly by ± tolerance: L 20 %, C 20 %, ESR 50 %, DCR 30 %,
 * load current 50 %, Vin 10 % [common practice: typical part and line/load tolerances].
 */
function makeDesigns(count: number, seed: number): Doc[] {
	const nominal = ['buck-ceramic-1v2', 'boost-ceramic-5v-12v'].map(
		(name) => JSON.parse(readFileSync(path.join(ROOT, 'reference', 'cases', `${name}.json`), 'utf8')) as Doc
	);
	const next = rng(seed);
	const spread = (x: number, tol: number) => x * (1 + tol * (2 * next() - 1));
	const designs: Doc[] = [];
	for (let i = 0; i < count; i++) {
		const base = nominal[i % 2];
		const d: Doc = structuredClone(base);
		const p = d.plant;
		p.inductor.l = spread(p.inductor.l, 0.2);
		p.inductor.dcr = spread(p.inductor.dcr, 0.3);
		p.capacitors[0].c = spread(p.capacitors[0].c, 0.2);
		p.capacitors[0].esr = spread(p.capacitors[0].esr, 0.5);
		p.iout = spread(p.iout, 0.5);
		p.vin = spread(p.vin, 0.1);
		d.sweep = { startHz: 10, stopHz: p.fsw / 2, points: SWEEP_POINTS };
		designs.push(d);
	}
	return designs;
}

interface Metrics {
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	gainMarginDb: number | null;
}

interface Timing {
	/** Wall-clock ms per design. */
	msPerDesign: number;
	/** CPU ms per design of the measuring process (all its threads). */
	cpuMsPerDesign: number;
}

/**
 * A full garbage collection, so a timed round does not pay for the set-up's garbage (the designs'
 * JSON for Python, the warm-up pass); the round's own garbage is still collected inside it.
 * node exposes gc() only behind --expose-gc; the flag can be set at run time.
 */
const collectGarbage: () => void = (() => {
	setFlagsFromString('--expose-gc');
	return runInNewContext('gc') as () => void;
})();

function runEngine(designs: Doc[]): Timing & { metrics: Metrics[] } {
	const metrics: Metrics[] = new Array(designs.length);
	collectGarbage();
	const c0 = process.cpuUsage();
	const t0 = performance.now();
	for (let i = 0; i < designs.length; i++) {
		const res = analyzeDesign(designs[i], OPTIONS);
		if ('error' in res) throw new Error(`design ${i} rejected: ${res.error.message}`);
		// Keep the three numbers the numpy script returns, as it does; holding every full response
		// would add old-generation GC work to the timing that the Python side does not have.
		const m = res.metrics;
		metrics[i] = { crossoverHz: m.crossoverHz, phaseMarginDeg: m.phaseMarginDeg, gainMarginDb: m.gainMarginDb };
	}
	const elapsed = performance.now() - t0;
	const cpu = process.cpuUsage(c0);
	return { msPerDesign: elapsed / designs.length, cpuMsPerDesign: (cpu.user + cpu.system) / 1000 / designs.length, metrics };
}

function runNumpy(dir: string): Timing & { wallMs: number; numpy: string; metrics: Metrics[] } {
	const inFile = path.join(dir, 'designs.json');
	const outFile = path.join(dir, 'results.json');
	const t0 = performance.now();
	const run = spawnSync('python3', [path.join(ROOT, 'reference', 'bench_numpy.py'), inFile, outFile], { encoding: 'utf8' });
	const wallMs = performance.now() - t0;
	if (run.status !== 0) throw new Error(`reference/bench_numpy.py failed (status ${run.status}): ${run.stderr}`);
	const out = JSON.parse(readFileSync(outFile, 'utf8'));
	return { msPerDesign: out.msPerDesign, cpuMsPerDesign: out.cpuMsPerDesign, wallMs, numpy: out.numpy, metrics: out.results };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

function main() {
	const designs = makeDesigns(COUNT, SEED);
	console.log(`Loopwright bench: ${COUNT} designs (buck and boost, seed ${SEED}), sweep 10 Hz to fsw/2, ${RUNS} round(s)`);
	console.log('engine: analyzeDesign(doc, { includeResponse: false }) = full metrics and closed-loop poles, no Bode arrays;');
	console.log(`        timed after ${WARMUP_PASSES} untimed pass over the designs (JIT warm-up), heap collected before each round`);
	const dir = mkdtempSync(path.join(tmpdir(), 'loopwright-bench-'));
	writeFileSync(path.join(dir, 'designs.json'), JSON.stringify({ designs }));
	const tsWall: number[] = [];
	const pyWall: number[] = [];
	const tsCpu: number[] = [];
	const pyCpu: number[] = [];
	let ts: ReturnType<typeof runEngine> | null = null;
	let py: ReturnType<typeof runNumpy> | null = null;
	try {
		for (let pass = 0; pass < WARMUP_PASSES; pass++) for (const d of designs) analyzeDesign(d, OPTIONS);
		for (let round = 1; round <= RUNS; round++) {
			ts = runEngine(designs);
			py = runNumpy(dir);
			tsWall.push(ts.msPerDesign);
			pyWall.push(py.msPerDesign);
			tsCpu.push(ts.cpuMsPerDesign);
			pyCpu.push(py.cpuMsPerDesign);
			console.log(
				`round ${round}: engine ${ts.cpuMsPerDesign.toFixed(4)} ms CPU (${ts.msPerDesign.toFixed(4)} wall) per design, ` +
					`numpy ${py.cpuMsPerDesign.toFixed(4)} ms CPU (${py.msPerDesign.toFixed(4)} wall; ` +
					`${(py.wallMs / 1000).toFixed(1)} s with start-up and file exchange), ratio ${(py.cpuMsPerDesign / ts.cpuMsPerDesign).toFixed(2)} CPU, ` +
					`${(py.msPerDesign / ts.msPerDesign).toFixed(2)} wall`
			);
		}
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
	// CPU time is what each analysis costs; on a shared machine wall time also counts the time a
	// process waits for a core. On an idle machine the two agree (both sides are single-threaded).
	const tsMed = median(tsCpu);
	const pyMed = median(pyCpu);
	console.log(`engine (TypeScript, full metrics):     ${tsMed.toFixed(4)} ms CPU per design (median of ${RUNS}; wall ${median(tsWall).toFixed(4)} ms)`);
	console.log(`numpy ${py!.numpy} (${SWEEP_POINTS}-point sweep):      ${pyMed.toFixed(4)} ms CPU per design (median of ${RUNS}; wall ${median(pyWall).toFixed(4)} ms)`);
	const ratio = pyMed / tsMed;
	const wallRatio = median(pyWall) / median(tsWall);
	console.log(
		`ratio numpy / engine:                  ${ratio.toFixed(2)} CPU (engine ${ratio >= 1 ? `${ratio.toFixed(2)}x faster` : `${(1 / ratio).toFixed(2)}x slower`}; ` +
			`target: at least 2x faster); wall ${wallRatio.toFixed(2)}`
	);

	let worst = { diff: -1, index: -1, engine: NaN, numpy: NaN };
	let disagree = 0;
	for (let i = 0; i < designs.length; i++) {
		const a = ts!.metrics[i].phaseMarginDeg;
		const b = py!.metrics[i].phaseMarginDeg;
		if (a === null || b === null) {
			if (a !== b) disagree++;
			continue;
		}
		const diff = Math.abs(a - b);
		if (diff > worst.diff) worst = { diff, index: i, engine: a, numpy: b };
	}
	console.log(`largest PM difference:                 ${worst.diff.toFixed(4)}° (design ${worst.index}, ${designs[worst.index]?.plant.topology}: engine ${worst.engine.toFixed(4)}°, numpy ${worst.numpy.toFixed(4)}°; target: within 0.1°)`);
	if (disagree) console.log(`designs where only one side found a crossover: ${disagree}`);
}

main();
