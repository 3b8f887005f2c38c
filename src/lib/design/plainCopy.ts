/**
 * A deep copy of plain data (objects, arrays, numbers, strings, booleans, null; typed arrays kept
 * as they are) for a worker message: it reads through Svelte's state proxies, which the
 * structured clone of postMessage refuses. `$state.snapshot` gives the same for plain data but
 * sends every number through `structuredClone` (a call per sample of a 400-point sweep), which
 * was most of the design screen's work when an input settled.
 */
export function plainCopy<T>(value: T): T {
	if (typeof value !== 'object' || value === null || ArrayBuffer.isView(value)) return value;
	if (Array.isArray(value)) return value.map(plainCopy) as T;
	const out: Record<string, unknown> = {};
	for (const key of Object.keys(value)) out[key] = plainCopy((value as Record<string, unknown>)[key]);
	return out as T;
}
