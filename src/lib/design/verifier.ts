/**
 * The design screen's verdict: the engine's verifyDesign of the document the screen would save,
 * run in a worker that answers only the latest request (latestWorker.ts), so the verdict shown is
 * always the current document's.
 */
import type { DesignDocumentInput, Verification } from '$lib/engine';
import type { CornerReport } from '$lib/engine/corners/corners';
import { createLatestWorker } from './latestWorker';
import type { FromVerifier, ToVerifier } from './verifyProtocol';

export interface VerifiedDesign {
	document: DesignDocumentInput;
	verification: Verification;
	corners: CornerReport;
	elapsedMs: number;
}

export interface Verifier {
	request(document: DesignDocumentInput, traceFreqHz: ArrayLike<number>): void;
	dispose(): void;
}

export function createVerifier(onResult: (r: VerifiedDesign) => void, onError: (message: string) => void): Verifier {
	let pending: DesignDocumentInput | null = null;
	const worker = createLatestWorker<ToVerifier, FromVerifier>(
		() => new Worker(new URL('./verify.worker.ts', import.meta.url), { type: 'module' }),
		(m) => {
			if (m.type === 'verdict') onResult({ document: pending!, verification: m.verification, corners: m.corners, elapsedMs: m.elapsedMs });
			else onError(m.message);
		},
		(message) => onError(message || 'The verdict worker stopped.')
	);
	return {
		request(document, traceFreqHz) {
			pending = document;
			const freq = Array.from(traceFreqHz);
			worker.request((id) => ({ type: 'verify', id, document, traceFreqHz: freq }));
		},
		dispose: () => worker.dispose()
	};
}
