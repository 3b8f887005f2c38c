/**
 * Second half of `npm run bench`: the 10 000-sample Monte Carlo spread (runSpread, seeded) on a
 * buck and a boost reference case, against reference/bench_spread_numpy.py analysing the very same
 * samples (exported with sampleParameters, exchanged through a temporary JSON file). Rounds
 * alternate engine and numpy [BENCH_RUNS = 3]; it prints ms per sample for both, their ratio, the
 * yield from each and the largest phase-margin difference. A benchmark: nothing here asserts a time.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { analyzeDesignDetailed } from '../src/lib/engine/analyze';
import { loopSpecFromDetail, type LoopSpec } from '../src/lib/engine/corners/loopModel';
import { runSpread, sampleParameters, type SpreadConfig, type SpreadResult } from '../src/lib/engine/spread/spread';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const SAMPLES = Number(process.env.BENCH_SPREAD_SAMPLES ?? 10_000);
const SEED = Number(process.env.BENCH_SPREAD_SEED ?? 20261207);
const RUNS = Math.max(1, Math.floor(Number(process.env.BENCH_RUNS ?? 3)));
const CASES = ['buck-ceramic-1v2', 'boost-ceramic-5v-12v'];
const POINTS = 500;
// Samples run once before timing so the JIT has compiled the hot paths (numpy has no warm-up).
const WARMUP = 1000;

/**
 * Part tolerances [common practice: power inductors ±20 %, ceramic output capacitors ±20 %,
 * ESR and DCR spread on datasheet typicals, 1 % resistors, 10 % small capacitors]; both
 * distributions used (normal: σ = tol/3, clipped at ±tol).
 */
const TOLERANCES: SpreadConfig['tolerances'] = {
	l: { tol: 0.2, dist: 'normal' },
	c: { tol: 0.2, dist: 'uniform' },
	esr: { tol: 0.5, dist: 'uniform' },
	dcr: { tol: 0.1, dist: 'normal' },
	r1: { tol: 0.01, dist: 'uniform' },
	r2: { tol: 0.01, dist: 'uniform' },
	r3: { tol: 0.01, dist: 'uniform' },
	c1: { tol: 0.1, dist: 'normal' },
	c2: { tol: 0.1, dist: 'normal' },
	c3: { tol: 0.1, dist: 'normal' }
};
// Yield targets: the case's own phase-margin target (the one its parts were placed for) and the
// preferred gain margin of the formula sheet §7.2 [common practice: GM 10 dB].
const GM_TARGET_DB = 10;

interface Targets {
	phaseMarginDeg: number;
	gainMarginDb: number;
}

interface Case {
	name: string;
	spec: LoopSpec;
	targets: Targets;
	config: SpreadConfig;
}

function loadCase(name: string): Case {
	const doc = JSON.parse(readFileSync(path.join(ROOT, 'reference', 'cases', `${name}.json`), 'utf8'));
	const detail = analyzeDesignDetailed(doc, { includeResponse: false });
	if ('error' in detail) throw new Error(`${name}: ${detail.error.message}`);
	const spec = loopSpecFromDetail(detail);
	// The numpy side writes out the one-branch closed forms of §1–§5 with an ideal op-amp.
	const caps = spec.stage.capacitors;
	if (caps.length !== 1 || caps[0].esl !== 0 || spec.opamp !== null || spec.parts.kind === 'type2-ota') {
		throw new Error(`${name}: the numpy reference needs one capacitor branch without ESL and an ideal op-amp Type I/II/III`);
	}
	const targets = { phaseMarginDeg: doc.compensator.target.phaseMarginDeg as number, gainMarginDb: GM_TARGET_DB };
	return { name, spec, targets, config: { samples: SAMPLES, seed: SEED, tolerances: TOLERANCES, targets } };
}

/** One row per sample: every value the loop gain depends on, as sampled by the engine. */
function sampleRows(c: Case) {
	return sampleParameters(c.spec, c.config).map((s) => {
		const b = s.stage.capacitors[0];
		const q = s.parts as unknown as Record<string, number | undefined>;
		return {
			vin: s.stage.vin,
			vout: s.stage.vout,
			iout: s.stage.iout,
			l: s.stage.l,
			dcr: s.stage.dcr,
			rdsOn: s.stage.rdsOn,
			c: b.c,
			esr: b.esr,
			count: b.count,
			vramp: s.modulator.vramp,
			vinNominal: s.vinNominal,
			feedForward: s.modulator.feedForward,
			delayS: s.modulator.delayS,
			r1: q.r1!,
			r2: q.r2 ?? 0,
			r3: q.r3 ?? 0,
			c1: q.c1!,
			c2: q.c2 ?? 0,
			c3: q.c3 ?? 0
		};
	});
}

interface NumpyCase {
	name: string;
	msPerSample: number;
	msPerSampleBroadcast: number;
	broadcastPmDiffDeg: number;
	results: { crossoverHz: (number | null)[]; phaseMarginDeg: (number | null)[]; gainMarginDb: (number | null)[] };
	yield: number;
}

function runEngine(c: Case): { msPerSample: number; result: SpreadResult } {
	const t0 = performance.now();
	const result = runSpread(c.spec, c.config);
	return { msPerSample: (performance.now() - t0) / result.completed, result };
}

function runNumpy(inFile: string, outFile: string): { numpy: string; wallMs: number; cases: NumpyCase[] } {
	const t0 = performance.now();
	const run = spawnSync('python3', [path.join(ROOT, 'reference', 'bench_spread_numpy.py'), inFile, outFile], { encoding: 'utf8' });
	const wallMs = performance.now() - t0;
	if (run.status !== 0) throw new Error(`reference/bench_spread_numpy.py failed (status ${run.status}): ${run.stderr}`);
	const out = JSON.parse(readFileSync(outFile, 'utf8'));
	return { numpy: out.numpy, wallMs, cases: out.cases };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const pct = (x: number) => `${(100 * x).toFixed(2)} %`;

/** Fraction meeting the PM and GM targets, without the stability test (like-for-like with numpy). */
function marginYield(r: SpreadResult, t: Targets): number {
	let ok = 0;
	for (let i = 0; i < r.completed; i++) if (r.phaseMarginDeg[i] >= t.phaseMarginDeg && r.gainMarginDb[i] >= t.gainMarginDb) ok++;
	return ok / r.completed;
}

function compare(r: SpreadResult, py: NumpyCase, t: Targets) {
	const worst = { pm: -1, pmAt: -1, fcRel: 0, gm: 0 };
	let onlyOne = 0;
	let verdicts = 0;
	for (let i = 0; i < r.completed; i++) {
		const a = r.phaseMarginDeg[i];
		const b = py.results.phaseMarginDeg[i];
		const okA = a >= t.phaseMarginDeg && r.gainMarginDb[i] >= t.gainMarginDb;
		const g = py.results.gainMarginDb[i];
		const okB = b !== null && b >= t.phaseMarginDeg && g !== null && g >= t.gainMarginDb;
		if (okA !== okB) verdicts++;
		if (Number.isNaN(a) || b === null) {
			if (Number.isNaN(a) !== (b === null)) onlyOne++;
			continue;
		}
		if (Math.abs(a - b) > worst.pm) worst.pm = Math.abs(a - b), (worst.pmAt = i);
		const fcB = py.results.crossoverHz[i]!;
		worst.fcRel = Math.max(worst.fcRel, Math.abs(r.crossoverHz[i] / fcB - 1));
		if (g !== null && !Number.isNaN(r.gainMarginDb[i])) worst.gm = Math.max(worst.gm, Math.abs(r.gainMarginDb[i] - g));
	}
	return { ...worst, onlyOne, verdicts };
}

function main() {
	const cases = CASES.map(loadCase);
	console.log(
		`\nLoopwright spread bench: ${SAMPLES} Monte Carlo samples per case (seed ${SEED}), ${RUNS} round(s); ` +
			`yield targets: the case's PM target, GM ≥ ${GM_TARGET_DB} dB`
	);
	console.log(`tolerances: ${Object.entries(TOLERANCES).map(([k, t]) => `${k} ±${100 * t!.tol}% ${t!.dist}`).join(', ')}`);
	const dir = mkdtempSync(path.join(tmpdir(), 'loopwright-bench-spread-'));
	const inFile = path.join(dir, 'samples.json');
	const outFile = path.join(dir, 'results.json');
	writeFileSync(
		inFile,
		JSON.stringify({
			cases: cases.map((c) => ({
				name: c.name,
				topology: c.spec.stage.topology,
				kind: c.spec.parts.kind,
				points: POINTS,
				rangeHz: [c.spec.rangeHz.startHz, c.spec.rangeHz.stopHz],
				targets: c.targets,
				samples: sampleRows(c)
			}))
		})
	);
	for (const c of cases) runSpread(c.spec, { ...c.config, samples: WARMUP, seed: SEED + 1 });

	const ts = new Map<string, number[]>(CASES.map((n) => [n, []]));
	const py = new Map<string, number[]>(CASES.map((n) => [n, []]));
	const pyBroadcast = new Map<string, number[]>(CASES.map((n) => [n, []]));
	let engine = new Map<string, SpreadResult>();
	let numpy: ReturnType<typeof runNumpy> | null = null;
	try {
		for (let round = 1; round <= RUNS; round++) {
			engine = new Map();
			for (const c of cases) {
				const e = runEngine(c);
				ts.get(c.name)!.push(e.msPerSample);
				engine.set(c.name, e.result);
			}
			numpy = runNumpy(inFile, outFile);
			for (const n of numpy.cases) {
				py.get(n.name)!.push(n.msPerSample);
				pyBroadcast.get(n.name)!.push(n.msPerSampleBroadcast);
			}
			console.log(
				`round ${round}: ` +
					cases
						.map((c) => `${c.name} engine ${ts.get(c.name)!.at(-1)!.toFixed(4)} / numpy ${py.get(c.name)!.at(-1)!.toFixed(4)} ms per sample`)
						.join('; ') +
					` (numpy ${(numpy.wallMs / 1000).toFixed(1)} s wall time with start-up and file exchange)`
			);
		}
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}

	console.log(`engine: runSpread (margins refined on the exact loop, closed-loop stability per sample, histograms); numpy ${numpy!.numpy}: ${POINTS}-point sweep, sign changes, linear interpolation`);
	let tsAll = 0;
	let pyAll = 0;
	let pyBAll = 0;
	for (const c of cases) {
		const r = engine.get(c.name)!;
		const n = numpy!.cases.find((x) => x.name === c.name)!;
		const [a, b, bb] = [median(ts.get(c.name)!), median(py.get(c.name)!), median(pyBroadcast.get(c.name)!)];
		tsAll += a;
		pyAll += b;
		pyBAll += bb;
		const d = compare(r, n, c.targets);
		console.log(`${c.name} (${c.spec.stage.topology}, ${c.spec.parts.kind}; PM ≥ ${c.targets.phaseMarginDeg}°, GM ≥ ${c.targets.gainMarginDb} dB), medians of ${RUNS}:`);
		console.log(`  engine ${a.toFixed(4)} ms per sample; numpy loop ${b.toFixed(4)} ms per sample, ratio numpy/engine ${(b / a).toFixed(2)}; numpy broadcast in blocks ${bb.toFixed(4)} ms per sample, ratio ${(bb / a).toFixed(2)}`);
		console.log(
			`  yield: engine ${pct(r.yield.all)} (PM and GM targets and closed loop stable; stable ${pct(r.yield.stable)}, ${r.failures} not modelled), ` +
				`engine PM+GM only ${pct(marginYield(r, c.targets))}, numpy ${pct(n.yield)}; verdicts differ on ${d.verdicts} sample(s)`
		);
		console.log(
			`  largest PM difference ${d.pm.toFixed(4)}° (sample ${d.pmAt}: engine ${r.phaseMarginDeg[d.pmAt].toFixed(4)}°, numpy ${n.results.phaseMarginDeg[d.pmAt]?.toFixed(4)}°); ` +
				`largest fc difference ${(100 * d.fcRel).toFixed(4)} %; largest GM difference ${d.gm.toFixed(4)} dB` +
				(d.onlyOne ? `; ${d.onlyOne} sample(s) where only one side found a crossover` : '') +
				`; numpy loop vs broadcast PM ${n.broadcastPmDiffDeg.toExponential(1)}°`
		);
	}
	const ratio = pyAll / tsAll;
	console.log(
		`spread, both cases: engine ${(tsAll / cases.length).toFixed(4)} ms per sample, numpy loop ${(pyAll / cases.length).toFixed(4)}, ratio numpy/engine ${ratio.toFixed(2)} ` +
			`(engine ${ratio >= 1 ? `${ratio.toFixed(2)}x faster` : `${(1 / ratio).toFixed(2)}x slower`}); numpy broadcast ${(pyBAll / cases.length).toFixed(4)}, ratio ${(pyBAll / tsAll).toFixed(2)}`
	);
}

main();
