/**
 * Runs the shared engine for the design screen: the nominal design (placement, rounding,
 * margins), then every corner with the nominal's built parts held fixed, all on one shared
 * frequency grid so traces, hover and the drag preview line up sample for sample.
 */
import {
	analyzeDesignDetailed,
	frequencyResponse,
	logGrid,
	type AnalysisDetail,
	type ContractError,
	type DesignDocumentInput
} from '$lib/engine';
import { designCorners, type DesignCorner } from './corners';
import { fieldForPath, type FormResult, type FormTargets, type OperatingRange } from './form';

export const PLOT_POINTS = 400;

export interface CornerAnalysis {
	corner: DesignCorner;
	detail: AnalysisDetail | null;
	/** The engine's words when this corner cannot be analysed (e.g. duty above its limit). */
	error: string | null;
	/** Fm·Gvd on the shared grid, for the drag preview (computed on first use). */
	plantLoop?: { magDb: Float64Array; phaseDeg: Float64Array };
}

export interface DesignAnalysis {
	freqHz: Float64Array;
	document: DesignDocumentInput;
	range: OperatingRange;
	targets: FormTargets;
	nominal: AnalysisDetail;
	corners: CornerAnalysis[];
	/** Wall time of the whole run, ms (shown as a diagnostic). */
	elapsedMs: number;
}

export type AnalysisOutcome =
	| { ok: true; analysis: DesignAnalysis }
	| { ok: false; message: string; fieldErrors: Record<string, string> };

/** Plot grid: from two decades below the LC resonance (decade-aligned) to fsw. */
export function plotGrid(doc: DesignDocumentInput): Float64Array {
	const p = doc.plant;
	const cTotal = p.capacitors.reduce((s, b) => s + b.c * (b.count ?? 1), 0);
	const dPrime = p.topology === 'boost' ? p.vin / p.vout : 1;
	const f0 = dPrime / (2 * Math.PI * Math.sqrt(p.inductor.l * cTotal));
	const start = 10 ** Math.floor(Math.log10(Math.min(f0 / 100, p.fsw / 1e4)));
	return logGrid(start, p.fsw, PLOT_POINTS);
}

function contractMessage(e: ContractError): { message: string; fieldErrors: Record<string, string> } {
	const fieldErrors: Record<string, string> = {};
	const unplaced: string[] = [];
	for (const [path, message] of Object.entries(e.error.fields)) {
		const field = fieldForPath(path);
		if (field) fieldErrors[field] ??= message;
		else unplaced.push(`${path} ${message}`);
	}
	const message = e.error.code === 'compensator-infeasible' || unplaced.length || Object.keys(fieldErrors).length === 0 ? e.error.message : 'Some values break a rule; see the marked fields.';
	return { message, fieldErrors };
}

/** The nominal's built network as fixed parts, for the corners. */
function fixedCompensator(nominal: AnalysisDetail): DesignDocumentInput['compensator'] {
	const c = nominal.response.compensator;
	const built = c.rounded ?? c.ideal;
	const parts: Record<string, number> = {};
	for (const [k, v] of Object.entries(built.parts)) if (k !== 'r1' && k !== 'rb') parts[k] = v;
	const doc = nominal.document.compensator;
	const out: Record<string, unknown> = { kind: doc.kind, parts, series: null };
	if (doc.opamp) out.opamp = doc.opamp;
	return out as DesignDocumentInput['compensator'];
}

export function cornerDocument(doc: DesignDocumentInput, compensator: DesignDocumentInput['compensator'], corner: DesignCorner): DesignDocumentInput {
	const vrampScale = doc.modulator.feedForward ? corner.vin / doc.plant.vin : 1;
	return {
		...doc,
		plant: { ...doc.plant, vin: corner.vin, iout: corner.iout },
		modulator: { ...doc.modulator, vramp: doc.modulator.vramp * vrampScale },
		compensator
	};
}

export function analyzeForm(form: FormResult): AnalysisOutcome {
	if (!form.document || !form.range || !form.targets) return { ok: false, message: 'Some values cannot be read; see the marked fields.', fieldErrors: form.errors };
	const t0 = performance.now();
	const freqHz = plotGrid(form.document);
	const sweep = { freqHz: Array.from(freqHz) };
	const doc: DesignDocumentInput = { ...form.document, sweep };
	// The closed-loop section is computed by the panels that show it, only while they are open.
	const nominal = analyzeDesignDetailed(doc, { closedLoop: false });
	if ('error' in nominal) return { ok: false, ...contractMessage(nominal) };

	const compensator = fixedCompensator(nominal);
	const corners = designCorners(form.range).map((corner): CornerAnalysis => {
		if (corner.nominal) return { corner, detail: nominal, error: null };
		const r = analyzeDesignDetailed(cornerDocument(doc, compensator, corner), { closedLoop: false });
		return 'error' in r ? { corner, detail: null, error: r.error.message } : { corner, detail: r, error: null };
	});
	return {
		ok: true,
		analysis: { freqHz, document: doc, range: form.range, targets: form.targets, nominal, corners, elapsedMs: performance.now() - t0 }
	};
}

/** Fm·Gvd of a corner on the shared grid (cached on the corner). */
export function plantLoopResponse(a: DesignAnalysis, c: CornerAnalysis) {
	if (!c.plantLoop && c.detail) {
		const r = frequencyResponse(c.detail.plantLoop, a.freqHz);
		c.plantLoop = { magDb: r.magDb, phaseDeg: r.phaseDeg };
	}
	return c.plantLoop ?? null;
}
