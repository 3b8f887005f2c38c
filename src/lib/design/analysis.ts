/**
 * Runs the shared engine for the design screen's plots: the nominal design (placement, rounding,
 * margins), then every operating case of the engine's one corner set (corners/operatingCases.ts)
 * with the nominal's built parts held fixed, all on one shared frequency grid so traces, hover and
 * the drag preview line up sample for sample. The verdict is not computed here: it is the
 * engine's verifyDesign of the same document (verifier.ts), as the server stores it.
 */
import {
	analyzeDesignDetailed,
	analyzeValidatedDesign,
	designDocumentSchema,
	frequencyResponse,
	logGrid,
	operatingPointDocument,
	type AnalysisDetail,
	type AnalyzeOptions,
	type ContractError,
	type DesignDocumentInput
} from '$lib/engine';
import { cornerLabel, operatingCases } from '$lib/engine/corners/operatingCases';
import { compensatorSchema } from '$lib/engine/compensators/schema';
import { modulatorSchema, plantSchema, type DesignDocument } from '$lib/engine/contract/designSchema';
import { fieldForPath, type FormResult, type FormTargets, type OperatingRange } from './form';

export interface DesignCorner {
	id: string;
	vin: number;
	iout: number;
	nominal: boolean;
	/** "Vin max, Iout min": the engine's label, the words used in the verdict. */
	label: string;
}

/** The operating cases of a range (the engine's one corner set, without tolerances), nominal first. */
export function designCorners(range: OperatingRange): DesignCorner[] {
	return operatingCases({
		vin: range.vin[1],
		iout: range.iout[1],
		vinRange: { min: range.vin[0], max: range.vin[2] },
		ioutRange: { min: range.iout[0], max: range.iout[2] }
	}).map((c) => ({ id: `vin-${c.vinCase}_iout-${c.ioutCase}`, vin: c.vin, iout: c.iout, nominal: c.nominal, label: cornerLabel(c) }));
}

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
	/** The analysed document with the plot's sweep. */
	document: DesignDocumentInput;
	/** The same document without the sweep: what is saved and verified. */
	verifyDocument: DesignDocumentInput;
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
export function fixedCompensator(nominal: AnalysisDetail): DesignDocumentInput['compensator'] {
	const c = nominal.response.compensator;
	const built = c.rounded ?? c.ideal;
	const parts: Record<string, number> = {};
	for (const [k, v] of Object.entries(built.parts)) if (k !== 'r1' && k !== 'rb') parts[k] = v;
	const doc = nominal.document.compensator;
	const out: Record<string, unknown> = { kind: doc.kind, parts, series: null };
	if (doc.opamp) out.opamp = doc.opamp;
	return out as DesignDocumentInput['compensator'];
}

/**
 * An operating case's document as designDocumentSchema would parse it, without parsing the parts
 * it shares with the nominal again: only the plant (its Vin and Iout), the modulator (the ramp
 * follows Vin) and the fixed network differ, and no whole-document rule reads Vin or Iout. On a
 * keystroke the nine parses of the 400-point sweep were a third of the analysis. Null when a
 * changed section does not parse: the caller then takes the whole-document path and its error.
 */
function validatedCorner(nominal: DesignDocument, corner: DesignDocumentInput, compensator: DesignDocument['compensator']): DesignDocument | null {
	const plant = plantSchema.safeParse(corner.plant);
	const modulator = modulatorSchema.safeParse(corner.modulator);
	if (!plant.success || !modulator.success) return null;
	return { ...nominal, plant: plant.data, modulator: modulator.data, compensator };
}

/** How an operating case is analysed for the plot: no closed-loop section, no sections, no closed-loop poles. */
export const CASE_OPTIONS = { closedLoop: false, sections: false, closedLoopPoles: false } as const satisfies AnalyzeOptions;

export function analyzeForm(form: FormResult): AnalysisOutcome {
	if (!form.document || !form.range || !form.targets) return { ok: false, message: 'Some values cannot be read; see the marked fields.', fieldErrors: form.errors };
	const t0 = performance.now();
	const freqHz = plotGrid(form.document);
	const sweep = { freqHz: Array.from(freqHz) };
	const doc: DesignDocumentInput = { ...form.document, sweep };
	// The closed-loop section is computed by the panels that show it, only while they are open.
	// Parsed once (analyzeDesignDetailed is this parse plus analyzeValidatedDesign); a document
	// that does not parse takes the whole path for its error. The sweep is our own log grid with
	// exact endpoints, so it is checked as its range (the bounds each of its points would be
	// checked against) instead of point by point: on a keystroke, parsing the 400 frequencies was
	// most of this parse and its garbage. The engine then gets the list itself.
	const parsedNominal = designDocumentSchema.safeParse({ ...form.document, sweep: { startHz: freqHz[0], stopHz: freqHz[freqHz.length - 1], points: freqHz.length } });
	const validNominal: DesignDocument | null = parsedNominal.success ? { ...parsedNominal.data, sweep } : null;
	const nominal = validNominal ? analyzeValidatedDesign(validNominal, { closedLoop: false, sections: false }) : analyzeDesignDetailed(doc, { closedLoop: false, sections: false });
	if ('error' in nominal) return { ok: false, ...contractMessage(nominal) };

	const compensator = fixedCompensator(nominal);
	const parsedCompensator = compensatorSchema.safeParse(compensator);
	// What the plot needs of an operating case: its traces and margins, not the whole analysis.
	// The fixed network's Gc does not depend on the case, so it is evaluated once (from the first
	// case's own built network) and handed to the others; the closed-loop poles are left out (the
	// stability verdict stays). Same engine run, same numbers (tests/unit/design/analysisCorners.test.ts).
	let networkResponse: AnalyzeOptions['networkResponse'];
	const corners = designCorners(form.range).map((corner): CornerAnalysis => {
		if (corner.nominal) return { corner, detail: nominal, error: null };
		const cornerDoc = operatingPointDocument(doc, corner, compensator);
		const validated = validNominal && parsedCompensator.success ? validatedCorner(validNominal, cornerDoc, parsedCompensator.data) : null;
		const r = validated ? analyzeValidatedDesign(validated, { ...CASE_OPTIONS, networkResponse }) : analyzeDesignDetailed(cornerDoc, CASE_OPTIONS);
		if ('error' in r) return { corner, detail: null, error: r.error.message };
		networkResponse ??= frequencyResponse(r.compensator.built, freqHz);
		return { corner, detail: r, error: null };
	});
	return {
		ok: true,
		analysis: { freqHz, document: doc, verifyDocument: form.document, range: form.range, targets: form.targets, nominal, corners, elapsedMs: performance.now() - t0 }
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
