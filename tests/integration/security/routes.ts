// Reads the route tree from the source files, so the security tests cover every route the
// moment it is added: each /api/v1 handler (method, route pattern, its own source text with
// the file-local functions it calls), and each form action and server load of a page.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

export const ROUTES_DIR = 'src/routes';

/** Calls that run the permission check (guard.ts); requestedWorkspaceId also requires a caller. */
export const GUARD_CALLS = ['authorizeRow(', 'authorize(', 'requireCaller(', 'requestedWorkspaceId('] as const;
/** Calls that check the caller's role in a workspace, not only that someone signed in. */
export const ROLE_CALLS = ['authorizeRow(', 'authorize('] as const;
/** Calls that read the request body; the guard must come before them. */
export const BODY_CALLS = ['parseBody(', 'readJson(', 'request.json(', 'request.text(', 'request.formData(', 'request.arrayBuffer('] as const;

export interface ApiHandler {
	method: string;
	/** As the folders name it: /api/v1/projects/[id]. */
	route: string;
	file: string;
	/** The handler's own text plus any function of the same file it calls (one level). */
	source: string;
}

export interface PageServerExport {
	/** 'load' or the action name ('default', ...). */
	name: string;
	kind: 'load' | 'action';
	route: string;
	file: string;
	source: string;
}

function walk(dir: string, visit: (file: string) => void) {
	for (const name of readdirSync(dir)) {
		const full = join(dir, name);
		if (statSync(full).isDirectory()) walk(full, visit);
		else visit(full);
	}
}

/** URL path of a route folder: groups like (app) vanish. */
export function routeOf(file: string): string {
	const dir = relative(ROUTES_DIR, file).split(/[\\/]/).slice(0, -1);
	return '/' + dir.filter((s) => !/^\(.*\)$/.test(s)).join('/');
}

/** Top-level function declarations and arrow constants of a file, by name. */
function localFunctions(text: string): Map<string, string> {
	const out = new Map<string, string>();
	const starts = [...text.matchAll(/^(?:export\s+)?(?:async\s+)?function\s+(\w+)|^(?:export\s+)?const\s+(\w+)\s*=\s*(?:async\s*)?\(/gm)];
	starts.forEach((m, i) => {
		const end = i + 1 < starts.length ? starts[i + 1].index : text.length;
		out.set(m[1] ?? m[2], text.slice(m.index, end));
	});
	return out;
}

/** The text and the file-local functions it calls (one level), so a guard inside a helper counts. */
function withHelpers(own: string, helpers: Map<string, string>): string {
	const called = [...helpers.entries()].filter(([name, body]) => !own.includes(body) && new RegExp(`\\b${name}\\s*\\(`).test(own));
	return [own, ...called.map(([, body]) => body)].join('\n');
}

/** The text of one export up to the next top-level export. */
function exportText(text: string, start: number): string {
	const next = text.slice(start + 1).search(/^export\s/m);
	return next < 0 ? text.slice(start) : text.slice(start, start + 1 + next);
}

export function apiHandlers(): ApiHandler[] {
	const found: ApiHandler[] = [];
	walk(join(ROUTES_DIR, 'api', 'v1'), (file) => {
		if (!file.endsWith('+server.ts')) return;
		const text = readFileSync(file, 'utf8');
		const helpers = localFunctions(text);
		for (const m of text.matchAll(/^export const (GET|POST|PUT|PATCH|DELETE)\b/gm)) {
			found.push({ method: m[1], route: routeOf(file), file, source: withHelpers(exportText(text, m.index), helpers) });
		}
	});
	return found.sort((a, b) => `${a.route} ${a.method}`.localeCompare(`${b.route} ${b.method}`));
}

/** Form actions and server loads of every page (+page.server.ts, +layout.server.ts). */
export function pageServerExports(): PageServerExport[] {
	const found: PageServerExport[] = [];
	walk(ROUTES_DIR, (file) => {
		if (!/\+(page|layout)\.server\.ts$/.test(file)) return;
		const text = readFileSync(file, 'utf8');
		const helpers = localFunctions(text);
		const route = routeOf(file);
		const load = /^export const load\b|^export (?:async )?function load\b/m.exec(text);
		if (load) found.push({ name: 'load', kind: 'load', route, file, source: withHelpers(exportText(text, load.index), helpers) });
		const actions = /^export const actions\b/m.exec(text);
		if (actions) {
			const block = exportText(text, actions.index);
			// Each action is a key of the object: `name: async (...) =>` up to the next key at the same depth.
			const keys = [...block.matchAll(/^\t(\w+)\s*:\s*async\b/gm)];
			keys.forEach((k, i) => {
				const end = i + 1 < keys.length ? keys[i + 1].index : block.length;
				found.push({ name: k[1], kind: 'action', route, file, source: withHelpers(block.slice(k.index, end), helpers) });
			});
		}
	});
	return found;
}

/** Index of the first of `calls` in `source`, or -1. */
export function firstIndex(source: string, calls: readonly string[]): number {
	const hits = calls.map((c) => source.indexOf(c)).filter((i) => i >= 0);
	return hits.length ? Math.min(...hits) : -1;
}
