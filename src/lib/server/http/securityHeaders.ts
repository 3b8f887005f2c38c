// Security headers on every response. Pages carry the Content-Security-Policy SvelteKit writes from
// kit.csp in svelte.config.js (a fresh nonce per page for its own inline scripts and the theme
// script in app.html); every other answer (the JSON API, better-auth, exported files, errors) gets
// a policy under which nothing loads and nothing frames it. The rest are the usual companions
// [common practice: OWASP Secure Headers Project].
const FIXED: Record<string, string> = {
	'x-content-type-options': 'nosniff',
	'referrer-policy': 'same-origin',
	// For browsers without CSP frame-ancestors.
	'x-frame-options': 'DENY',
	'permissions-policy': 'camera=(), microphone=(), geolocation=(), payment=(), usb=()',
	'cross-origin-opener-policy': 'same-origin'
};

/** For answers that are not pages: an exported SVG opened on its own may style itself, nothing more. */
export const NON_PAGE_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src 'self' data:; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

export function withSecurityHeaders(response: Response): Response {
	let out = response;
	try {
		out.headers.set('x-content-type-options', 'nosniff');
	} catch {
		// Headers of a response passed through from fetch() are immutable: copy it.
		out = new Response(response.body, response);
	}
	for (const [name, value] of Object.entries(FIXED)) out.headers.set(name, value);
	if (!out.headers.has('content-security-policy')) out.headers.set('content-security-policy', NON_PAGE_CSP);
	return out;
}
