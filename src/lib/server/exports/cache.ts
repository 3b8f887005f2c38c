// Rendered exports (PNG, SVG, PDF) kept per revision and everything the file shows, so a second
// download of the same file does not draw it again (a stored revision's design never changes;
// its verdict, status, names and review trail are part of the key). Bounded: at most
// MAX_ENTRIES files and MAX_BYTES in all, least recently used dropped first; a file larger than
// MAX_ENTRY_BYTES is never kept. Per server process.
import { createHash } from 'node:crypto';

const MAX_ENTRIES = 256;
const MAX_BYTES = 64 * 1024 * 1024;
const MAX_ENTRY_BYTES = 8 * 1024 * 1024;

type Body = string | Buffer;
const entries = new Map<string, Body>();
let bytes = 0;

const sizeOf = (b: Body) => (typeof b === 'string' ? Buffer.byteLength(b) : b.length);

/** A key naming every input of a file: hashed, so the map holds short strings whatever the inputs. */
export function exportKey(parts: unknown): string {
	return createHash('sha256').update(JSON.stringify(parts)).digest('base64url');
}

function remember(key: string, body: Body) {
	const size = sizeOf(body);
	if (size > MAX_ENTRY_BYTES) return;
	entries.set(key, body);
	bytes += size;
	for (const [oldest, value] of entries) {
		if (entries.size <= MAX_ENTRIES && bytes <= MAX_BYTES) break;
		entries.delete(oldest);
		bytes -= sizeOf(value);
	}
}

/** Drawings under way by key: a second request for a file being drawn (a download right after
 * the save's pre-render began) waits for that drawing instead of starting another. */
const drawing = new Map<string, Promise<unknown>>();

/**
 * The file under `key`, drawn by `render` only when it is not kept yet nor being drawn. A render
 * that answers something other than a file (an error object) is passed through and not kept.
 */
export async function cachedExport<B extends Body, T>(key: string, render: () => Promise<B | T>): Promise<B | T> {
	const kept = entries.get(key) as B | undefined;
	if (kept !== undefined) {
		// Refresh its place: Map keeps insertion order, the first entry is the least recently used.
		entries.delete(key);
		entries.set(key, kept);
		return kept;
	}
	const under = drawing.get(key) as Promise<B | T> | undefined;
	if (under) return under;
	const started = render().then((body) => {
		if (typeof body === 'string' || Buffer.isBuffer(body)) remember(key, body);
		return body;
	});
	drawing.set(key, started);
	try {
		return await started;
	} finally {
		drawing.delete(key);
	}
}

/** For tests: how many files and bytes are kept. */
export function exportCacheSize() {
	return { entries: entries.size, bytes };
}
