/** Sensitivity of the margins to every part (docs/formulas.md §12). */
import { analyzeValidatedDesign, type AnalysisDetail } from '../analyze';
import type { ContractError } from '../contract/errors';
import type { DesignDocument } from '../contract/designSchema';
import { loopSpecFromDetail } from '../corners/loopModel';
import { sensitivity, type SensitivityParameter, type SensitivityReport } from './sensitivity';

export * from './sensitivity';

/** The ranked sensitivities of a validated document at its nominal point, tolerances from its `tolerances`. */
export function designSensitivity(doc: DesignDocument): SensitivityReport | ContractError {
	const detail = analyzeValidatedDesign(doc, { includeResponse: false, closedLoop: false, sections: false });
	if ('error' in detail) return detail;
	return detailSensitivity(detail);
}

/** The same from an analysis already made (the review page's and the report's). */
export function detailSensitivity(detail: AnalysisDetail): SensitivityReport {
	const tol: Partial<Record<SensitivityParameter, number>> = {};
	for (const [name, t] of Object.entries(detail.document.tolerances ?? {})) if (t && t.tol > 0) tol[name as SensitivityParameter] = t.tol;
	return sensitivity(loopSpecFromDetail(detail), tol);
}
