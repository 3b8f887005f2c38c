/**
 * Verdict worker: the engine's verifyDesign (corners × tolerances, spread, rules) off the main
 * thread, so typing stays smooth while every corner and spread sample runs.
 */
import { verifyValidatedDesignDetailed } from '$lib/engine';
import type { FromVerifier, ToVerifier } from './verifyProtocol';
import { answerEachRequest, validDocument } from './workerReplies';

answerEachRequest<ToVerifier, FromVerifier>((m) => {
	const t0 = performance.now();
	const valid = validDocument(m.document);
	if ('message' in valid) return valid;
	const r = verifyValidatedDesignDetailed(valid.document, { traceFreqHz: m.traceFreqHz });
	return 'error' in r ? { type: 'error', message: r.error.message } : { type: 'verdict', verification: r.verification, corners: r.corners, elapsedMs: performance.now() - t0 };
});
