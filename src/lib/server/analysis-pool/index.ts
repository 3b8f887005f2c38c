// Every analysis the server runs goes through here (API, saves, review and report pages,
// exports, templates, bench overlays): one pool per process, started on first use, with the
// limits of limits.ts. The verbs take the user the work is for (the per-user limit) first.
import type { AnalyzeOptions } from '../../engine/analyze';
import { analysisLimits } from './limits';
import { AnalysisPool, workerFilename, type PoolStats } from './pool';
import type { StoredRequest } from './tasks';
import type { FitDesignInput } from '../../engine/fit';

export { AnalysisPool, workerFilename, type PoolStats } from './pool';
export { analysisLimits, type AnalysisLimits } from './limits';
export type { StoredRequest, TaskOutput } from './tasks';

let shared: Promise<AnalysisPool> | null = null;

function pool(): Promise<AnalysisPool> {
	if (!shared) {
		shared = workerFilename().then((filename) => new AnalysisPool(analysisLimits(), filename));
		// adapter-node's shutdown: end the workers with the server.
		process.once('sveltekit:shutdown', () => void shared?.then((p) => p.destroy()));
	}
	return shared;
}

/** Starts the workers now (server start), so the first analysis does not wait for them to load. */
export function startAnalysisPool(): void {
	void pool();
}

/** Running and waiting analyses (for /api/health); zeros before the first analysis. */
export async function poolStats(): Promise<PoolStats> {
	if (!shared) return { threads: analysisLimits().threads, running: 0, waiting: 0 };
	return (await shared).stats();
}

/** POST /api/v1/analyze: status (200, or 400 with field errors) and the serialised answer. */
export async function analyzeJson(owner: string, document: unknown) {
	return (await pool()).run(owner, { name: 'analyzeJson', input: { document } }, document);
}

export async function analyze(owner: string, document: unknown, options?: AnalyzeOptions) {
	return (await pool()).run(owner, { name: 'analyze', input: { document, options } }, document);
}

/** The answer and the validated document (defaults filled in). */
export async function analyzeDocument(owner: string, document: unknown, options?: AnalyzeOptions) {
	return (await pool()).run(owner, { name: 'analyzeDocument', input: { document, options } }, document);
}

/** A stored revision as the review page, the report and the exports draw it. */
export async function stored(owner: string, request: StoredRequest) {
	return (await pool()).run(owner, { name: 'stored', input: request }, request.design);
}

/** The verdict of a design document (services/verify.ts is the server's one entry to it). */
export async function verify(owner: string, document: unknown) {
	return (await pool()).run(owner, { name: 'verify', input: { document } }, document);
}

/** The switching check of a design (services/switching-check.ts keeps it with a revision). */
export async function switchingCheck(owner: string, document: unknown, freqHz?: number[]) {
	return (await pool()).run(owner, { name: 'switchingCheck', input: { document, freqHz } }, document);
}

/** A fit of a design to a bench measurement (services/bench.ts fit); over budget answers name the design's fields. */
export async function fit(owner: string, input: FitDesignInput) {
	return (await pool()).run(owner, { name: 'fit', input }, input.document);
}
