/**
 * Parameter differences between two saved loop revisions: walks both design documents and lists
 * every leaf whose value differs, by document path (dots, array indices as numbers, the same
 * spelling as the contract's field errors: `plant.capacitors.0.esr`). Values display in
 * engineering notation with the unit the field's name implies (SI inside, as the contract says).
 */
import { formatDb, formatDeg, formatEng, formatPart, type UnitSymbol } from '$lib/units';

export interface FieldChange {
	path: string;
	/** undefined where the field exists on one side only. */
	before: unknown;
	after: unknown;
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Every changed leaf path, in document order of the first document (then fields only in the second). */
export function diffDocuments(a: unknown, b: unknown, prefix = ''): FieldChange[] {
	if (Array.isArray(a) && Array.isArray(b)) {
		const out: FieldChange[] = [];
		for (let i = 0; i < Math.max(a.length, b.length); i++) out.push(...diffDocuments(a[i], b[i], join(prefix, String(i))));
		return out;
	}
	if (isRecord(a) && isRecord(b)) {
		const keys = [...Object.keys(a), ...Object.keys(b).filter((k) => !(k in a))];
		return keys.flatMap((k) => diffDocuments(a[k], b[k], join(prefix, k)));
	}
	if (Object.is(a, b)) return [];
	// A whole sub-tree on one side only, or a leaf against a tree: list the leaves of each side.
	if ((isRecord(a) || Array.isArray(a)) && b === undefined) return diffDocuments(a, emptyLike(a), prefix).map((c) => ({ ...c, after: undefined }));
	if ((isRecord(b) || Array.isArray(b)) && a === undefined) return diffDocuments(emptyLike(b), b, prefix).map((c) => ({ ...c, before: undefined }));
	return [{ path: prefix || '(document)', before: a, after: b }];
}

function join(prefix: string, key: string) {
	return prefix ? `${prefix}.${key}` : key;
}

function emptyLike(v: unknown): unknown {
	return Array.isArray(v) ? [] : {};
}

/** The unit a field's last name implies (contract field names: l, dcr, esr, c1, r2, fsw, …). */
export function unitOfPath(path: string): { unit: UnitSymbol; part: boolean } | 'deg' | 'db' | null {
	const key = path.split('.').filter((k) => !/^\d+$/.test(k)).pop() ?? '';
	if (/Deg$/.test(key)) return 'deg';
	if (/Db$/.test(key)) return 'db';
	if (/Hz$/.test(key) || key === 'fsw' || key === 'gbw') return { unit: 'Hz', part: false };
	if (/^(l|esl)$/.test(key)) return { unit: 'H', part: true };
	if (/^(c|c\d)$/.test(key)) return { unit: 'F', part: true };
	if (/^(r\d|dcr|esr|rdsOn)$/.test(key)) return { unit: 'Ω', part: true };
	if (/^(vin|vout|vramp|vref)$/.test(key)) return { unit: 'V', part: false };
	if (key === 'iout') return { unit: 'A', part: false };
	if (key === 'delay') return { unit: 's', part: false };
	if (key === 'gm') return { unit: 'S', part: false };
	return null;
}

/** One side of a change for display: "4.7 µH", "55.0°", "E96", "(none)". */
export function formatChangeValue(path: string, value: unknown): string {
	if (value === undefined || value === null) return '(none)';
	if (typeof value === 'number') {
		const u = unitOfPath(path);
		if (u === 'deg') return formatDeg(value);
		if (u === 'db') return formatDb(value);
		if (u) return u.part ? formatPart(value, u.unit) : formatEng(value, u.unit);
		return formatEng(value, '', { digits: 4 });
	}
	if (typeof value === 'string') return value;
	return JSON.stringify(value);
}
