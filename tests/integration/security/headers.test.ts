// Security headers on every kind of answer: pages (SvelteKit's nonce-based Content-Security-Policy
// with frame-ancestors 'none'), the JSON API, better-auth's endpoints, exported files, errors and
// redirects (a policy under which nothing loads or frames them). Pages could be framed before.
import '../support/env';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { servedApp } from '../support/app';
import { signUp, type Client } from '../support/client';

const app = servedApp();
let user: Client;

beforeAll(async () => {
	user = await signUp(app.origin, 'headers');
});
afterAll(() => undefined);

async function headersOf(path: string, init: RequestInit = {}) {
	const response = await fetch(app.origin + path, { redirect: 'manual', ...init, headers: { origin: app.origin, ...(init.headers ?? {}) } });
	await response.arrayBuffer();
	return { status: response.status, headers: response.headers };
}

/** The directives of a policy as a map: name → sources. */
function directives(policy: string | null): Map<string, string[]> {
	return new Map(
		(policy ?? '')
			.split(';')
			.map((d) => d.trim().split(/\s+/))
			.filter((d) => d[0])
			.map(([name, ...sources]) => [name, sources])
	);
}

// [common practice: OWASP Secure Headers Project]
function expectCompanions(headers: Headers, what: string) {
	expect(headers.get('x-content-type-options'), what).toBe('nosniff');
	expect(headers.get('x-frame-options'), what).toBe('DENY');
	expect(headers.get('referrer-policy'), what).toBe('same-origin');
	expect(headers.get('permissions-policy'), what).toMatch(/camera=\(\)/);
	const csp = directives(headers.get('content-security-policy'));
	expect(csp.get('frame-ancestors'), what).toEqual(["'none'"]);
	return csp;
}

describe('security headers', () => {
	it('pages: a nonce-based script policy without unsafe-inline, nothing may frame them', async () => {
		for (const path of ['/', '/sign-in', '/sign-up']) {
			const { status, headers } = await headersOf(path);
			expect(status, path).toBe(200);
			const csp = expectCompanions(headers, path);
			const scripts = csp.get('script-src') ?? [];
			expect(scripts, path).toContain("'self'");
			expect(scripts.some((s) => /^'nonce-[A-Za-z0-9+/=]+'$/.test(s)), path).toBe(true);
			expect(scripts, path).not.toContain("'unsafe-inline'");
			expect(scripts, path).not.toContain("'unsafe-eval'");
			expect(csp.get('default-src'), path).toEqual(["'self'"]);
			expect(csp.get('object-src'), path).toEqual(["'none'"]);
		}
	});

	it('the nonce changes on every page and is the one on the inline scripts of that page', async () => {
		const nonces: string[] = [];
		for (let i = 0; i < 2; i++) {
			const response = await fetch(app.origin + '/sign-in');
			const html = await response.text();
			const nonce = /'nonce-([^']+)'/.exec(response.headers.get('content-security-policy') ?? '')?.[1];
			expect(nonce).toBeTruthy();
			const inline = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)].map((m) => m[1]);
			expect(inline.length).toBeGreaterThan(0);
			for (const attrs of inline) expect(attrs).toContain(`nonce="${nonce}"`);
			nonces.push(nonce!);
		}
		expect(nonces[0]).not.toBe(nonces[1]);
	});

	it('signed-in pages, the API, better-auth, a 404 and a redirect all carry them', async () => {
		const cookie = { cookie: user.cookie };
		// [path, request, status, a JSON answer (its own policy: nothing loads) or a page]
		const cases: [string, RequestInit, number, boolean][] = [
			['/w', { headers: cookie }, 200, false],
			['/api/v1/me', { headers: cookie }, 200, true],
			['/api/v1/me', {}, 401, true],
			['/api/health', {}, 200, true],
			['/api/auth/get-session', { headers: cookie }, 200, true],
			['/api/v1/no-such-route', { headers: cookie }, 404, false],
			['/no-such-page', {}, 404, false],
			['/w', {}, 303, true]
		];
		for (const [path, init, expected, notPage] of cases) {
			const { status, headers } = await headersOf(path, init);
			expect(status, path).toBe(expected);
			const csp = expectCompanions(headers, `${path} ${expected}`);
			if (notPage) expect(csp.get('default-src'), path).toEqual(["'none'"]);
		}
	});
});
