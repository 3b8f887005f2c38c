/**
 * Monte Carlo spread of the loop metrics: N samples of the part values, each part drawn as
 * nominal·(1 + δ) with δ uniform in ±tol or normal with σ = tol/sigmas truncated at ±tol
 * [common practice: tolerance as a hard limit, 3σ by default]; capacitor c/esr/esl drawn per
 * branch. A seeded generator (prng.ts) makes a run reproduce for any chunking. Pure and
 * chunked (step / cancel / progress) so a Web Worker can drive it; margins from
 * analysis/margins (docs/formulas.md §7), closed-loop stability by Routh–Hurwitz or the poles (§7.3).
 */
import { buildLoop, type LoopSpec } from '../corners/loopModel';
import { applyVariation, PART_NAMES, partsPresent, type PartName, type Variation } from '../corners/variation';
import { loopMetrics } from '../analysis/margins';
import { isDesignInputError } from '../errors';
import { createRng, type Rng } from './prng';
import { histogram, statistics, type Histogram, type Statistics } from './histogram';
import { DEFAULT_SAMPLES, MAX_SAMPLES } from './limits';

export { DEFAULT_SAMPLES, MAX_SAMPLES };

export interface PartTolerance {
	/** Relative limit (0.1 = ±10 %). */
	tol: number;
	dist: 'uniform' | 'normal';
	/** Normal only: tol = sigmas·σ [3]. */
	sigmas?: number;
}

export interface SpreadTargets {
	phaseMarginDeg?: number;
	gainMarginDb?: number;
	crossoverHz?: { min?: number; max?: number };
}

export interface SpreadConfig {
	samples?: number;
	seed?: number;
	tolerances: Partial<Record<PartName, PartTolerance>>;
	targets?: SpreadTargets;
	/** Histogram bins [40]. */
	bins?: number;
}

export interface SpreadResult {
	requested: number;
	completed: number;
	cancelled: boolean;
	seed: number;
	/** Per sample; NaN where a metric does not exist or the sample could not be modelled. */
	crossoverHz: Float64Array;
	phaseMarginDeg: Float64Array;
	gainMarginDb: Float64Array;
	/** 1 stable, 0 unstable, −1 unknown or failed. */
	stable: Int8Array;
	failures: number;
	unstable: number;
	/** Fraction of completed samples meeting each target and all of them (stable included). */
	yield: { all: number; phaseMargin: number | null; gainMargin: number | null; crossover: number | null; stable: number };
	histograms: { crossoverHz: Histogram; phaseMarginDeg: Histogram; gainMarginDb: Histogram };
	stats: { crossoverHz: Statistics; phaseMarginDeg: Statistics; gainMarginDb: Statistics };
	targets: SpreadTargets;
}

const SAMPLE_METRICS = { closedLoopPoles: false } as const;

/** One draw of δ for a tolerance. */
function draw(rng: Rng, t: PartTolerance): number {
	if (t.dist === 'uniform') return t.tol * (2 * rng.next() - 1);
	const sigma = t.tol / (t.sigmas ?? 3);
	for (;;) {
		const d = sigma * rng.normal();
		if (Math.abs(d) <= t.tol) return d;
	}
}

/** The variation of the next sample (draws in a fixed order: parts by PART_NAMES, branches by index). */
export function sampleVariation(rng: Rng, spec: LoopSpec, tolerances: SpreadConfig['tolerances'], present: Set<PartName>): Variation {
	const factors: Partial<Record<PartName, number>> = {};
	const branchFactors: { c?: number[]; esr?: number[]; esl?: number[] } = {};
	for (const name of PART_NAMES) {
		const t = tolerances[name];
		if (!t || !(t.tol > 0) || !present.has(name)) continue;
		if (name === 'c' || name === 'esr' || name === 'esl') {
			branchFactors[name] = spec.stage.capacitors.map(() => 1 + draw(rng, t));
		} else factors[name] = 1 + draw(rng, t);
	}
	return { factors, branchFactors };
}

export interface SpreadRun {
	readonly total: number;
	readonly done: number;
	readonly cancelled: boolean;
	/** Run up to maxSamples more; true when the run is complete (or cancelled). */
	step(maxSamples: number): boolean;
	cancel(): void;
	/** Summary of the samples done so far. */
	result(): SpreadResult;
}

interface Sampler {
	total: number;
	seed: number;
	/** The next sample's perturbed loop spec. */
	next(): LoopSpec;
}

/** The one source of a run's samples, shared by createSpreadRun and sampleParameters. */
function createSampler(spec: LoopSpec, config: SpreadConfig): Sampler {
	const total = Math.floor(config.samples ?? DEFAULT_SAMPLES);
	if (!(total >= 1 && total <= MAX_SAMPLES)) throw new RangeError(`spread.samples must be 1…${MAX_SAMPLES}`);
	const seed = Math.floor(config.seed ?? 1);
	const rng = createRng(seed);
	const present = new Set(partsPresent(spec));
	return { total, seed, next: () => applyVariation(spec, sampleVariation(rng, spec, config.tolerances, present)) };
}

/**
 * The perturbed loop specs a run with this config evaluates, in sample order (the same draws
 * as runSpread), so an outside tool (the numpy bench) can analyse exactly the same parts.
 */
export function sampleParameters(spec: LoopSpec, config: SpreadConfig): LoopSpec[] {
	const sampler = createSampler(spec, config);
	return Array.from({ length: sampler.total }, () => sampler.next());
}

export function createSpreadRun(spec: LoopSpec, config: SpreadConfig): SpreadRun {
	const sampler = createSampler(spec, config);
	const { total, seed } = sampler;
	const fc = new Float64Array(total).fill(NaN);
	const pm = new Float64Array(total).fill(NaN);
	const gm = new Float64Array(total).fill(NaN);
	const stable = new Int8Array(total).fill(-1);
	let done = 0;
	let failures = 0;
	let cancelled = false;
	return {
		get total() {
			return total;
		},
		get done() {
			return done;
		},
		get cancelled() {
			return cancelled;
		},
		step(maxSamples: number) {
			const end = Math.min(total, done + Math.max(1, Math.floor(maxSamples)));
			while (!cancelled && done < end) {
				const s = sampler.next();
				try {
					// Only the stability verdict is kept per sample, so Routh–Hurwitz may stand in for the poles.
					const m = loopMetrics(buildLoop(s).loop, s.rangeHz, SAMPLE_METRICS);
					fc[done] = m.crossoverHz ?? NaN;
					pm[done] = m.phaseMarginDeg ?? NaN;
					gm[done] = m.gainMarginDb ?? NaN;
					stable[done] = m.closedLoopStable === null ? -1 : m.closedLoopStable ? 1 : 0;
				} catch (e) {
					if (!isDesignInputError(e) && !(e instanceof RangeError)) throw e;
					failures++;
				}
				done++;
			}
			return cancelled || done >= total;
		},
		cancel() {
			cancelled = true;
		},
		result() {
			return summarise(
				{ fc: fc.subarray(0, done), pm: pm.subarray(0, done), gm: gm.subarray(0, done), stable: stable.subarray(0, done) },
				{ requested: total, cancelled, seed, failures, targets: config.targets ?? {}, bins: config.bins ?? 40 }
			);
		}
	};
}

function summarise(
	d: { fc: Float64Array; pm: Float64Array; gm: Float64Array; stable: Int8Array },
	o: { requested: number; cancelled: boolean; seed: number; failures: number; targets: SpreadTargets; bins: number }
): SpreadResult {
	const n = d.fc.length;
	const t = o.targets;
	let okPm = 0;
	let okGm = 0;
	let okFc = 0;
	let okStable = 0;
	let okAll = 0;
	let unstable = 0;
	for (let i = 0; i < n; i++) {
		const st = d.stable[i] === 1;
		if (d.stable[i] === 0) unstable++;
		const a = t.phaseMarginDeg === undefined || d.pm[i] >= t.phaseMarginDeg;
		const b = t.gainMarginDb === undefined || d.gm[i] >= t.gainMarginDb;
		const lo = t.crossoverHz?.min;
		const hi = t.crossoverHz?.max;
		const c = (lo === undefined || d.fc[i] >= lo) && (hi === undefined || d.fc[i] <= hi) && (lo === undefined && hi === undefined ? true : !Number.isNaN(d.fc[i]));
		if (a) okPm++;
		if (b) okGm++;
		if (c) okFc++;
		if (st) okStable++;
		if (a && b && c && st) okAll++;
	}
	const frac = (k: number) => (n === 0 ? 0 : k / n);
	return {
		requested: o.requested,
		completed: n,
		cancelled: o.cancelled,
		seed: o.seed,
		crossoverHz: d.fc,
		phaseMarginDeg: d.pm,
		gainMarginDb: d.gm,
		stable: d.stable,
		failures: o.failures,
		unstable,
		yield: {
			all: frac(okAll),
			phaseMargin: t.phaseMarginDeg === undefined ? null : frac(okPm),
			gainMargin: t.gainMarginDb === undefined ? null : frac(okGm),
			crossover: t.crossoverHz === undefined ? null : frac(okFc),
			stable: frac(okStable)
		},
		histograms: {
			crossoverHz: histogram(d.fc, o.bins, 'log'),
			phaseMarginDeg: histogram(d.pm, o.bins, 'linear'),
			gainMarginDb: histogram(d.gm, o.bins, 'linear')
		},
		stats: { crossoverHz: statistics(d.fc), phaseMarginDeg: statistics(d.pm), gainMarginDb: statistics(d.gm) },
		targets: t
	};
}

/** Whole run at once (server reports, benchmarks). */
export function runSpread(spec: LoopSpec, config: SpreadConfig): SpreadResult {
	const run = createSpreadRun(spec, config);
	run.step(run.total);
	return run.result();
}

export interface ChunkedOptions {
	/** Samples per chunk [200]. */
	chunkSize?: number;
	onProgress?: (done: number, total: number) => void;
	signal?: { readonly aborted: boolean };
	/** How to give the event loop a turn between chunks [setTimeout 0]. */
	yieldFn?: () => Promise<void>;
}

/** Chunked run for a Web Worker or the UI thread: progress after each chunk, stops on abort. */
export async function runSpreadChunked(spec: LoopSpec, config: SpreadConfig, options: ChunkedOptions = {}): Promise<SpreadResult> {
	const run = createSpreadRun(spec, config);
	const chunk = options.chunkSize ?? 200;
	const pause = options.yieldFn ?? (() => new Promise<void>((r) => setTimeout(r, 0)));
	for (;;) {
		if (options.signal?.aborted) run.cancel();
		const finished = run.step(chunk);
		options.onProgress?.(run.done, run.total);
		if (finished) break;
		await pause();
	}
	return run.result();
}
