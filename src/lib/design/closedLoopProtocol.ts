/**
 * Messages between the design screen and the closed-loop worker (closedLoop.worker.ts): the
 * screen sends the analysed document (with the plot's sweep) and the step inputs; the worker
 * answers with closedLoopOf of its own analysis of that document (the same function the screen
 * used to run on its main thread).
 */
import type { DesignDocumentInput } from '$lib/engine';
import type { ClosedLoopReport } from '$lib/engine/closedloop/sections';

export interface StepInputs {
	step: number;
	riseTime: number;
	referenceStep: number;
}

export type ToClosedLoop = { id: number; document: DesignDocumentInput; step: StepInputs };

export type FromClosedLoop =
	| { id: number; type: 'closed-loop'; report: ClosedLoopReport | null; warnings: string[] }
	| { id: number; type: 'error'; message: string };
