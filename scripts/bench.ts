/**
 * `npm run bench`: full loop metrics for 10 000 random buck and boost designs with the engine
 * (includeResponse: false: every metric and the closed-loop poles, no Bode arrays), then
 * reference/bench_numpy.py (a dense 500-point numpy sweep with sign-change search,
 * what an engineer would write instead) on the same designs, exchanged through a temporary JSON
 * file. Engine and numpy alternate for BENCH_RUNS rounds [3]; it prints each round and the
 * medians: ms per design for both (process CPU time, and wall time), their ratio and the largest
 * phase-margin difference. The engine's time is given twice: for the analysis of documents
 * already validated (analyzeValidatedDesign; the numpy script validates nothing either), and with
 * zod's validation of every raw document added (analyzeDesign, what the API and CLI run).
 * A second family does the same for peak current mode (docs/formulas.md §14: the five cases of
 * reference/currentmode with their Type II, spread the same way) against
 * reference/bench_currentmode_numpy.py, which evaluates the same Gvc directly in numpy.
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
import { analyzeValidatedDesign, designDocumentSchema, type DesignDocument } from '../src/lib/engine';

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

/** Voltage mode: two nominal reference cases with a fixed Type III compensator given by parts. */
const VOLTAGE_MODE_CASES = ['buck-ceramic-1v2', 'boost-ceramic-5v-12v'].map((name) => path.join('reference', 'cases', `${name}.json`));
/**
 * Peak current mode: the five cases of the switching-simulation check (reference/currentmode),
 * each with a fixed Type II given by parts.
 */
const CURRENT_MODE_CASES = ['buck-d028-mc13', 'buck-d066-mc17', 'buck-d052-mc11', 'boost-d058-rhp', 'buck-polymer-fc-fsw10'].map((name) =>
	path.join('reference', 'currentmode', 'cases', `${name}.json`)
);

/**
 * Nominal cases in turn, spread uniformly by ± tolerance: L 20 %, C 20 %, ESR 50 %, DCR 30 %,
 * load current 50 %, Vin 10 % [common practice: typical part and line/load tolerances].
 */
function makeDesigns(count: number, seed: number, cases: string[]): Doc[] {
	const nominal = cases.map((file) => JSON.parse(readFileSync(path.join(ROOT, file), 'utf8')) as Doc);
	const next = rng(seed);
	const spread = (x: number, tol: number) => x * (1 + tol * (2 * next() - 1));
	const designs: Doc[] = [];
	for (let i = 0; i < count; i++) {
		const base = nominal[i % nominal.length];
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

function timed<T>(work: () => T, count: number): Timing & { value: T } {
	collectGarbage();
	const c0 = process.cpuUsage();
	const t0 = performance.now();
	const value = work();
	const elapsed = performance.now() - t0;
	const cpu = process.cpuUsage(c0);
	return { msPerDesign: elapsed / count, cpuMsPerDesign: (cpu.user + cpu.system) / 1000 / count, value };
}

/** zod's validation of every raw document (defaults filled in): the part analyzeDesign adds. */
function validateAll(designs: Doc[]): DesignDocument[] {
	const out: DesignDocument[] = new Array(designs.length);
	for (let i = 0; i < designs.length; i++) {
		const parsed = designDocumentSchema.safeParse(designs[i]);
		if (!parsed.success) throw new Error(`design ${i} rejected: ${parsed.error.message}`);
		out[i] = parsed.data;
	}
	return out;
}

function analyseAll(documents: DesignDocument[]): Metrics[] {
	const metrics: Metrics[] = new Array(documents.length);
	for (let i = 0; i < documents.length; i++) {
		const res = analyzeValidatedDesign(documents[i], OPTIONS);
		if ('error' in res) throw new Error(`design ${i} rejected: ${res.error.message}`);
		// Keep the three numbers the numpy script returns, as it does; holding every full response
		// would add old-generation GC work to the timing that the Python side does not have.
		const m = res.response.metrics;
		metrics[i] = { crossoverHz: m.crossoverHz, phaseMarginDeg: m.phaseMarginDeg, gainMarginDb: m.gainMarginDb };
	}
	return metrics;
}

function runNumpy(dir: string, script: string): Timing & { wallMs: number; numpy: string; metrics: Metrics[] } {
	const inFile = path.join(dir, 'designs.json');
	const outFile = path.join(dir, 'results.json');
	const t0 = performance.now();
	const run = spawnSync('python3', [path.join(ROOT, 'reference', script), inFile, outFile], { encoding: 'utf8' });
	const wallMs = performance.now() - t0;
	if (run.status !== 0) throw new Error(`reference/${script} failed (status ${run.status}): ${run.stderr}`);
	const out = JSON.parse(readFileSync(outFile, 'utf8'));
	return { msPerDesign: out.msPerDesign, cpuMsPerDesign: out.cpuMsPerDesign, wallMs, numpy: out.numpy, metrics: out.results };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

function main() {
	console.log(`Loopwright bench: ${COUNT} designs per family (seed ${SEED}), sweep 10 Hz to fsw/2, ${RUNS} round(s)`);
	console.log('engine: analyzeValidatedDesign(doc, { includeResponse: false }) = full metrics and closed-loop poles, no Bode arrays;');
	console.log(`        timed after ${WARMUP_PASSES} untimed pass over the designs (JIT warm-up), heap collected before each round`);
	console.log('\n== voltage mode (buck and boost, Type III), against reference/bench_numpy.py');
	benchFamily(makeDesigns(COUNT, SEED, VOLTAGE_MODE_CASES), 'bench_numpy.py');
	// The same loop with the current loop closed inside the plant (docs/formulas.md §14): the engine
	// factors a polynomial two degrees higher per design; numpy evaluates Gvc directly.
	console.log('\n== peak current mode (four bucks and a boost, Type II), against reference/bench_currentmode_numpy.py');
	benchFamily(makeDesigns(COUNT, SEED, CURRENT_MODE_CASES), 'bench_currentmode_numpy.py');
}

function benchFamily(designs: Doc[], script: string) {
	const dir = mkdtempSync(path.join(tmpdir(), 'loopwright-bench-'));
	writeFileSync(path.join(dir, 'designs.json'), JSON.stringify({ designs }));
	const series = () => ({ wall: [] as number[], cpu: [] as number[] });
	const ts = series();
	const zod = series();
	const pyS = series();
	let metrics: Metrics[] = [];
	let py: ReturnType<typeof runNumpy> | null = null;
	const add = (s: ReturnType<typeof series>, t: Timing) => {
		s.wall.push(t.msPerDesign);
		s.cpu.push(t.cpuMsPerDesign);
	};
	try {
		for (let pass = 0; pass < WARMUP_PASSES; pass++) analyseAll(validateAll(designs));
		for (let round = 1; round <= RUNS; round++) {
			const v = timed(() => validateAll(designs), designs.length);
			const e = timed(() => analyseAll(v.value), designs.length);
			metrics = e.value;
			py = runNumpy(dir, script);
			add(zod, v);
			add(ts, e);
			add(pyS, py);
			console.log(
				`round ${round}: engine ${e.cpuMsPerDesign.toFixed(4)} ms CPU (${e.msPerDesign.toFixed(4)} wall) per design, ` +
					`validation ${v.cpuMsPerDesign.toFixed(4)} ms CPU (${v.msPerDesign.toFixed(4)} wall), ` +
					`numpy ${py.cpuMsPerDesign.toFixed(4)} ms CPU (${py.msPerDesign.toFixed(4)} wall; ` +
					`${(py.wallMs / 1000).toFixed(1)} s with start-up and file exchange)`
			);
		}
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
	// CPU time is what each analysis costs (it includes V8's parallel GC threads); on a shared
	// machine wall time also counts the time a process waits for a core.
	const m = (xs: number[]) => median(xs).toFixed(4);
	const ratios = (engineCpu: number, engineWall: number) => {
		const cpu = median(pyS.cpu) / engineCpu;
		return `${cpu.toFixed(2)} CPU, ${(median(pyS.wall) / engineWall).toFixed(2)} wall`;
	};
	console.log(`engine (TypeScript, full metrics):     ${m(ts.cpu)} ms CPU per design (median of ${RUNS}; wall ${m(ts.wall)} ms)`);
	console.log(`zod validation of the raw document:    ${m(zod.cpu)} ms CPU per design (median of ${RUNS}; wall ${m(zod.wall)} ms)`);
	console.log(`numpy ${py!.numpy} (${SWEEP_POINTS}-point sweep):      ${m(pyS.cpu)} ms CPU per design (median of ${RUNS}; wall ${m(pyS.wall)} ms)`);
	console.log(`ratio numpy / engine:                  ${ratios(median(ts.cpu), median(ts.wall))} (target: at least 2)`);
	const sum = (a: number[], b: number[]) => a.map((x, i) => x + b[i]);
	console.log(`ratio numpy / (validation + engine):   ${ratios(median(sum(ts.cpu, zod.cpu)), median(sum(ts.wall, zod.wall)))}`);

	// A governing crossing the engine finds at or above 0.4·fsw sits on the current loop's fsw/2
	// peak (the engine searches its whole analysed range, 5 Hz to 10·fsw, from the factored loop);
	// the numpy sweep ends at fsw/2 and its grid is coarser than a sharp peak. Those are counted
	// apart, so the PM comparison covers the designs where both look at the same crossing.
	let worst = { diff: -1, index: -1, engine: NaN, numpy: NaN };
	let disagree = 0;
	let atHalfFsw = 0;
	let compared = 0;
	for (let i = 0; i < designs.length; i++) {
		const a = metrics[i].phaseMarginDeg;
		const b = py!.metrics[i].phaseMarginDeg;
		const fc = metrics[i].crossoverHz;
		if (fc !== null && fc >= 0.4 * designs[i].plant.fsw) {
			atHalfFsw++;
			continue;
		}
		if (a === null || b === null) {
			if (a !== b) disagree++;
			continue;
		}
		compared++;
		const diff = Math.abs(a - b);
		if (diff > worst.diff) worst = { diff, index: i, engine: a, numpy: b };
	}
	console.log(`largest PM difference:                 ${worst.diff.toFixed(4)}° over ${compared} designs (design ${worst.index}, ${designs[worst.index]?.plant.topology}: engine ${worst.engine.toFixed(4)}°, numpy ${worst.numpy.toFixed(4)}°; target: within 0.1°)`);
	if (atHalfFsw) console.log(`designs whose governing crossing is on the fsw/2 peak (≥ 0.4·fsw, beyond the numpy sweep): ${atHalfFsw}`);
	if (disagree) console.log(`designs where only one side found a crossover: ${disagree}`);
}

main();
