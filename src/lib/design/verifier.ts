/**
 * The design screen's verdict: the engine's verifyDesign of the document the screen would save,
 * run in a worker. The latest request wins: a request made while the worker is busy ends that
 * worker and starts a fresh one, so the verdict shown is always the current document's.
 */
import type { DesignDocumentInput, Verification } from '$lib/engine';
import type { CornerReport } from '$lib/engine/corners/corners';
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
	let worker: Worker | null = null;
	let busy = false;
	let id = 0;
	let pending: DesignDocumentInput | null = null;
	const start = () => {
		const w = new Worker(new URL('./verify.worker.ts', import.meta.url), { type: 'module' });
		w.onmessage = (e: MessageEvent<FromVerifier>) => {
			const m = e.data;
			busy = false;
			if (m.id !== id) return;
			if (m.type === 'verdict') onResult({ document: pending!, verification: m.verification, corners: m.corners, elapsedMs: m.elapsedMs });
			else onError(m.message);
		};
		w.onerror = (e) => {
			busy = false;
			onError(e.message || 'The verdict worker stopped.');
		};
		return w;
	};
	return {
		request(document, traceFreqHz) {
			if (busy && worker) {
				worker.terminate();
				worker = null;
			}
			worker ??= start();
			id += 1;
			pending = document;
			busy = true;
			const msg: ToVerifier = { type: 'verify', id, document, traceFreqHz: Array.from(traceFreqHz) };
			worker.postMessage(msg);
		},
		dispose() {
			worker?.terminate();
			worker = null;
		}
	};
}
