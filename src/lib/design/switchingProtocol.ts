/**
 * Messages between the design screen and the switching-check worker (switching.worker.ts). The
 * worker runs the engine's switching check of one design document and reports progress after
 * each measured frequency; the screen cancels by ending the worker (the check has no pause
 * points of its own, and a fresh worker costs a few milliseconds).
 */
import type { SwitchingCheckResult } from '$lib/engine/switching/check';
import type { SwitchingStepComparison } from '$lib/engine/pipeline/switchingCircuit';

export type ToWorker = { type: 'start'; runId: number; document: unknown };

export type FromWorker =
	| { type: 'progress'; runId: number; done: number; total: number }
	| { type: 'result'; runId: number; result: SwitchingCheckResult; elapsedMs: number }
	| { type: 'error'; runId: number; message: string }
	/** After the result: the load step on the switched circuit beside the averaged one, or why there is none. */
	| { type: 'step'; runId: number; step: SwitchingStepComparison | { reason: string } };
