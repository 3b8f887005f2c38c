// Where a sign-in, sign-up, e-mail confirmation or invitation may send the user afterwards: a
// path on this site only. Shared by the server (redirects, the links better-auth mails) and the
// browser (links that carry the destination on), so both apply one rule.

/** Where a signed-in user lands when no page asked for them: the signed-in area's root. */
export const APP_HOME = '/w';

/** Any control character, any whitespace (Unicode included) or a backslash. */
const UNSAFE_CHARACTER = /[\u0000-\u001f\u007f-\u009f\s\\]/u;

/** Longest destination kept; a longer one is no page of ours. */
const MAX_LENGTH = 2048;

/**
 * `value` when it is a same-origin path, else `fallback`. A same-origin path starts with exactly
 * one `/`, and neither it nor its percent-decoded form holds `//` at the start, a backslash, a
 * control character or whitespace: browsers drop a tab or newline inside a URL and read `\` as
 * `/`, so `/<TAB>/evil.example` or `/\evil.example` would lead to another host. The answer is the
 * path as a URL parser reads it (path, query, fragment), checked to stay on this origin.
 */
export function safeRedirect(value: string | null | undefined, fallback = APP_HOME): string {
	if (typeof value !== 'string' || value.length === 0 || value.length > MAX_LENGTH) return fallback;
	let decoded: string;
	try {
		decoded = decodeURIComponent(value);
	} catch {
		return fallback;
	}
	for (const form of [value, decoded]) {
		if (!form.startsWith('/') || form.startsWith('//') || UNSAFE_CHARACTER.test(form)) return fallback;
	}
	const base = 'http://same-origin.invalid';
	let url: URL;
	try {
		url = new URL(value, base);
	} catch {
		return fallback;
	}
	if (url.origin !== base) return fallback;
	return url.pathname + url.search + url.hash;
}

/** The sign-in page, sending the user on to `next` afterwards (only when it is a safe path); `flags` add query members. */
export function signInPath(next?: string | null, flags: Record<string, string> = {}): string {
	const query = new URLSearchParams(flags);
	const destination = next ? safeRedirect(next, '') : '';
	if (destination) query.set('redirectTo', destination);
	const text = query.toString();
	return text ? `/sign-in?${text}` : '/sign-in';
}
