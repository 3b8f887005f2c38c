/**
 * The design form's part tolerances: one row per part the engine can vary, as typed text (± %)
 * and distribution. They become the design document's `tolerances` section, so the corners, the
 * spread and the stored verdict all use the same values.
 */
import type { DesignDocumentInput } from '$lib/engine';
import { PART_LABELS, PART_NAMES, partsPresent, type PartName } from '$lib/engine/corners/variation';
import type { LoopSpec } from '$lib/engine/corners/loopModel';
import type { PartTolerance } from '$lib/engine/spread/spread';
import { parseQuantity, formatForInput } from '$lib/units';
import type { FieldSpec } from './form';
import { DEFAULT_PART_TOLERANCES } from '$lib/spec/railSpec';

export interface ToleranceRow {
	part: PartName;
	label: string;
	/** Percent text, e.g. "20" for ±20 %. */
	tol: string;
	dist: 'uniform' | 'normal';
}


export const TOL_SPEC: FieldSpec = { label: 'Tolerance', unit: '', suffix: '%', min: 0, max: 90 };

const row = (part: PartName, tol: number, dist: 'uniform' | 'normal'): ToleranceRow => ({ part, label: PART_LABELS[part], tol: formatForInput(tol, '', 4), dist });

/** Every part with its usual tolerance and distribution (one table: DEFAULT_PART_TOLERANCES, $lib/spec/railSpec). */
export function defaultToleranceRows(): ToleranceRow[] {
	return PART_NAMES.map((part) => row(part, DEFAULT_PART_TOLERANCES[part].tol * 100, DEFAULT_PART_TOLERANCES[part].dist));
}

/** Rows from a document's tolerances section; parts it leaves out get 0 % (the document decides). */
export function toleranceRowsFromDocument(t: DesignDocumentInput['tolerances']): ToleranceRow[] {
	if (!t) return defaultToleranceRows();
	return PART_NAMES.map((part) => {
		const x = t[part];
		return row(part, x ? x.tol * 100 : 0, x?.dist ?? 'uniform');
	});
}

/** The rows of the parts this loop has, in the form's order (for the tables). */
export function presentRows(rows: ToleranceRow[], spec: LoopSpec | null): ToleranceRow[] {
	if (!spec) return rows;
	const present = new Set(partsPresent(spec));
	return rows.filter((r) => present.has(r.part));
}

type Read<T> = { value: T | null; errors: Record<string, string> };

export function readTolerances(rows: ToleranceRow[]): Read<Partial<Record<PartName, PartTolerance>>> {
	const errors: Record<string, string> = {};
	const out: Partial<Record<PartName, PartTolerance>> = {};
	for (const r of rows) {
		const p = parseQuantity(r.tol, TOL_SPEC);
		if (!p.ok) errors[`tol.${r.part}`] = p.error;
		else if (p.value > 0) out[r.part] = { tol: p.value / 100, dist: r.dist, sigmas: 3 };
	}
	return Object.keys(errors).length ? { value: null, errors } : { value: out, errors };
}
