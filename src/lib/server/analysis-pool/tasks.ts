// The work the analysis pool's workers do: engine calls on plain inputs, answering plain data
// (both cross the thread boundary by structured clone, so no functions or class instances).
// One entry per kind of server work; the verbs in index.ts are their typed front.
import { analyzeDesign, analyzeDesignDetailed, type AnalyzeOptions } from '../../engine/analyze';
import { netlistFromAnalysis, type SpiceOptions } from '../../engine/spice';
import type { Verification } from '../../engine/verify/types';
import { verifyDesign } from '../../engine/verify/verifyDesign';
import { analyzeStored, cornerTraces, stepResponses } from '../services/loop-analysis';
import { fitDesign, fittedDocument, type FitDesignInput } from '../../engine/fit';
import { designDocumentSchema } from '../../engine/contract/designSchema';
import { detailSensitivity } from '../../engine/sensitivity';
import { switchingCheckOfDesign } from '../../engine/pipeline/switchingCircuit';

export interface StoredRequest {
	design: unknown;
	/** The revision's stored verdict: loop traces of the corners that set it (none without). */
	verification?: Verification | null;
	/** Add the load and reference step responses. */
	steps?: boolean;
	/** Add the SPICE netlist. */
	netlist?: SpiceOptions;
	/** Add the ranked sensitivities of PM, GM and fc to every part. */
	sensitivity?: boolean;
}

const tasks = {
	/** POST /api/v1/analyze: the contract answer, already serialised (the request thread only sends it). */
	analyzeJson(input: { document: unknown }) {
		const result = analyzeDesign(input.document);
		return { status: 'error' in result ? 400 : 200, body: JSON.stringify(result) };
	},
	analyze(input: { document: unknown; options?: AnalyzeOptions }) {
		return analyzeDesign(input.document, input.options);
	},
	/** The answer and the validated document (defaults filled in). */
	analyzeDocument(input: { document: unknown; options?: AnalyzeOptions }) {
		const detail = analyzeDesignDetailed(input.document, input.options);
		return 'error' in detail ? detail : { document: detail.document, response: detail.response };
	},
	/** A stored revision as drawn by the review page, the report and the exports (its verdict is stored, not recomputed). */
	stored(input: StoredRequest) {
		const detail = analyzeStored(input.design);
		if ('error' in detail) return detail;
		return {
			document: detail.document,
			response: detail.response,
			cornerTraces: input.verification ? cornerTraces(detail, input.verification) : [],
			steps: input.steps ? stepResponses(detail) : null,
			netlist: input.netlist ? netlistFromAnalysis(detail, input.netlist) : null,
			sensitivity: input.sensitivity ? detailSensitivity(detail) : null
		};
	},
	/** A fit of a design's uncertain parameters to a bench measurement, with the document the fitted values make. */
	fit(input: FitDesignInput) {
		const result = fitDesign(input);
		if ('error' in result) return result;
		// fitDesign accepted the document, so this parse succeeds; it fills the defaults the analysis used.
		const document = designDocumentSchema.parse(input.document);
		return { fit: result, document: fittedDocument(document, result) };
	},
	/** The switching check of a design document (engine/switching; the frequencies asked for, or its defaults). */
	switchingCheck(input: { document: unknown; freqHz?: number[] }) {
		return switchingCheckOfDesign(input.document, input.freqHz ? { freqHz: input.freqHz } : {});
	},
	/** The verdict of a design document (saves, template use and re-verification). */
	verify(input: { document: unknown }) {
		return verifyDesign(input.document);
	}
};

export type TaskName = keyof typeof tasks;
export type TaskInput<K extends TaskName> = Parameters<(typeof tasks)[K]>[0];
export type TaskOutput<K extends TaskName> = ReturnType<(typeof tasks)[K]>;
export interface TaskRequest<K extends TaskName = TaskName> {
	name: K;
	input: TaskInput<K>;
}

export function runTask<K extends TaskName>(request: TaskRequest<K>): TaskOutput<K> {
	const task = tasks[request.name] as (input: TaskInput<K>) => TaskOutput<K>;
	return task(request.input);
}
