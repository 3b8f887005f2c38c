/**
 * One function from a design document to its verdict (DEVELOPERS.md, "Verdict rules"): the nominal analysis, the
 * operating × tolerance corners (corners/), the spread when the document asks for one (spread/),
 * every warning raised at any corner with the corners it appeared at, then pass / caution / fail
 * against the document's targets (rules.ts). The browser's live view and the server (which stores
 * the result with the revision) call this same function, so they show the same figures.
 */
import { analyzeValidatedDesign, type AnalysisDetail } from '../analyze';
import { contractError, zodFields, type ContractError } from '../contract/errors';
import { designDocumentSchema, type DesignDocument } from '../contract/designSchema';
import { spreadTargetsOf, targetsOf } from '../contract/targetsSchema';
import { runCorners, type CornerReport } from '../corners/corners';
import { loopSpecFromDetail } from '../corners/loopModel';
import type { PartName } from '../corners/variation';
import { DEFAULT_SERIES } from '../synthesis/rounding';
import { runSpread, type PartTolerance, type SpreadResult } from '../spread/spread';
import { ENGINE_VERSION } from '../version';
import { cornerChecksFor } from './checks';
import { verdictOf } from './rules';
import type { Verification, VerifiedCorner, Worst } from './types';

export interface VerifyOptions {
	/** Loop traces of the nominal and worst corners on this grid (for plots). */
	traceFreqHz?: ArrayLike<number>;
	/** Leave the spread out (null) even when the document has one, e.g. while typing [false]. */
	skipSpread?: boolean;
}

/** The verdict plus what it was computed from, for screens that also draw it. */
export interface VerificationDetail {
	verification: Verification;
	detail: AnalysisDetail;
	corners: CornerReport;
	spread: SpreadResult | null;
}

export function verifyDesign(doc: unknown, options: VerifyOptions = {}): Verification | ContractError {
	const parsed = designDocumentSchema.safeParse(doc);
	if (!parsed.success) return contractError(zodFields(parsed.error));
	return verifyValidatedDesign(parsed.data, options);
}

export function verifyValidatedDesign(doc: DesignDocument, options: VerifyOptions = {}): Verification | ContractError {
	const r = verifyValidatedDesignDetailed(doc, options);
	return 'error' in r ? r : r.verification;
}

export function verifyValidatedDesignDetailed(doc: DesignDocument, options: VerifyOptions = {}): VerificationDetail | ContractError {
	// The verdict never depends on the plot grid: the document's sweep is left out, so the
	// margin search covers the canonical range (f0/100 … 10·fsw) on every screen and the server.
	const analysed = analyzeValidatedDesign({ ...doc, sweep: undefined }, { includeResponse: false, closedLoop: false, sections: false });
	if ('error' in analysed) return analysed;
	try {
		return verifyAnalysed(doc, analysed, options);
	} catch (e) {
		const message = e instanceof Error ? e.message : String(e);
		return contractError({ '(engine)': message }, 'analysis-failed', `The engine could not verify this design: ${message}`);
	}
}

function verifyAnalysed(doc: DesignDocument, detail: AnalysisDetail, options: VerifyOptions): VerificationDetail {
	const targets = targetsOf(doc);
	const fswHz = doc.plant.fsw;
	const spec = loopSpecFromDetail(detail);
	const tolerances = doc.tolerances ?? {};
	const tol: Partial<Record<PartName, number>> = {};
	for (const [name, t] of Object.entries(tolerances)) if (t && t.tol > 0) tol[name as PartName] = t.tol;
	const report = runCorners(
		spec,
		{ vin: doc.corners?.vin, iout: doc.corners?.iout, temperature: doc.corners?.temperature, tolerances: tol, maxCorners: doc.corners?.maxCorners, checks: cornerChecksFor(doc) },
		options.traceFreqHz
	);

	let spread: SpreadResult | null = null;
	if (doc.spread && !options.skipSpread) {
		const tols: Partial<Record<PartName, PartTolerance>> = {};
		for (const [name, t] of Object.entries(tolerances)) if (t && t.tol > 0) tols[name as PartName] = { tol: t.tol, dist: t.dist, sigmas: t.sigmas };
		if (Object.keys(tols).length) {
			const s = doc.spread;
			spread = runSpread(spec, { samples: s.samples, seed: s.seed, tolerances: tols, targets: s.targets ?? spreadTargetsOf(targets, fswHz), bins: s.bins });
		}
	}

	const list: VerifiedCorner[] = report.corners.map((c) => ({
		label: c.label,
		vin: c.vin,
		iout: c.iout,
		...(c.temperatureC !== undefined ? { temperatureC: c.temperatureC } : {}),
		factors: { ...(c.factors as Record<string, number>) },
		crossoverHz: c.crossoverHz,
		phaseMarginDeg: c.phaseMarginDeg,
		gainMarginDb: c.gainMarginDb,
		closedLoopStable: c.closedLoopStable,
		warnings: c.warnings,
		error: c.error
	}));
	const worstOf = (w: CornerReport['worst'][keyof CornerReport['worst']]): Worst | null => (w ? { value: w.value, corner: w.corner.label } : null);
	const worst = {
		phaseMarginDeg: worstOf(report.worst.phaseMarginDeg),
		gainMarginDb: worstOf(report.worst.gainMarginDb),
		crossoverLowHz: worstOf(report.worst.crossoverLowHz),
		crossoverHighHz: worstOf(report.worst.crossoverHighHz)
	};
	const warnings = collectWarnings(detail, report);
	const spreadSummary = spread ? { samples: spread.completed, seed: spread.seed, yield: spread.yield.all, stable: spread.yield.stable } : null;
	const verdict = verdictOf({ targets, fswHz, corners: list, worst, spread: spreadSummary, warnings, peakCurrent: detail.document.modulator.control === 'peak-current' });
	const m = detail.metrics;
	const c = detail.compensator;
	const series = doc.compensator.series === undefined ? DEFAULT_SERIES : doc.compensator.series;
	const verification: Verification = {
		engineVersion: ENGINE_VERSION,
		...verdict,
		targets,
		nominal: {
			crossoverHz: m.crossoverHz,
			phaseMarginDeg: m.phaseMarginDeg,
			gainMarginDb: m.gainMarginDb,
			closedLoopStable: m.closedLoopStable,
			modulusMargin: m.modulusMargin
		},
		worst,
		corners: { mode: report.mode, count: list.length, unstable: report.unstableCorners, failed: report.failedCorners, list },
		spread: spreadSummary,
		warnings,
		parts: {
			ideal: { ...c.ideal.parts },
			rounded: c.rounded ? { ...c.rounded.parts } : null,
			series: c.rounded && series ? { resistors: series.resistors, capacitors: series.capacitors } : null
		}
	};
	return { verification, detail, corners: report, spread };
}

/** The nominal design's warnings and every corner's, merged by code with the corners each appeared at. */
function collectWarnings(detail: AnalysisDetail, report: CornerReport): Verification['warnings'] {
	const byCode = new Map<string, { code: string; message: string; corners: string[] }>();
	const nominal = report.corners[0]?.label ?? 'Vin nom, Iout nom';
	const add = (code: string, message: string, corner: string) => {
		let w = byCode.get(code);
		if (!w) byCode.set(code, (w = { code, message, corners: [] }));
		if (!w.corners.includes(corner)) w.corners.push(corner);
	};
	for (const w of detail.response.warnings) add(w.code, w.message, nominal);
	for (const c of report.corners) for (const code of c.warnings) add(code, report.warningMessages[code] ?? code, c.label);
	return [...byCode.values()];
}
