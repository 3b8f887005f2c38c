// The one rule for where sign-in, sign-up, e-mail confirmation and invitations may send a user:
// a path on this site. Each refused value below is a way browsers are known to read a path as
// another host [published: WHATWG URL Standard, "URL parsing" (tab and newline removed, `\`
// read as `/` in special schemes, `//` starts an authority)]; the accepted ones are our own pages.
import { describe, expect, it } from 'vitest';
import { APP_HOME, safeRedirect, signInPath } from '../../../src/lib/safeRedirect';

describe('safeRedirect', () => {
	const refused = [
		'/\t/evil.example/phish',
		'/\n/evil.example',
		'/\r\n/evil.example',
		'/ /evil.example',
		'/\u00a0/evil.example',
		'/\u2028/evil.example',
		'//evil',
		'//evil.example/x',
		'/\\evil',
		'/\\\\evil.example',
		'\\/evil.example',
		'https://evil',
		'http://evil.example/x',
		'javascript:alert(1)',
		'evil.example',
		'%2F%09%2Fevil.example%2Fphish',
		'/%09/evil.example/phish',
		'/%2F/evil.example',
		'/%5Cevil.example',
		'/%0d%0aLocation:%20https://evil.example',
		'/%E0%A4%A',
		'',
		'/' + 'a'.repeat(2048)
	];
	for (const value of refused) {
		it(`refuses ${JSON.stringify(value).slice(0, 60)}`, () => {
			expect(safeRedirect(value)).toBe(APP_HOME);
			expect(safeRedirect(value, '/fallback')).toBe('/fallback');
		});
	}

	it('refuses null and undefined', () => {
		expect(safeRedirect(null)).toBe(APP_HOME);
		expect(safeRedirect(undefined)).toBe(APP_HOME);
	});

	const kept: [string, string][] = [
		['/w', '/w'],
		['/w/boards', '/w/boards'],
		['/invitations/6f1c2a9e-2f0b-4a51-9c1e-3f1b2c3d4e5f', '/invitations/6f1c2a9e-2f0b-4a51-9c1e-3f1b2c3d4e5f'],
		['/w/abc/projects/def?tab=health#r2', '/w/abc/projects/def?tab=health#r2'],
		['/sign-in?verified=1&redirectTo=%2Fw%2Fboards', '/sign-in?verified=1&redirectTo=%2Fw%2Fboards'],
		// Dot segments resolve on this origin.
		['/w/../invitations/x', '/invitations/x']
	];
	for (const [value, answer] of kept) {
		it(`keeps ${value}`, () => expect(safeRedirect(value)).toBe(answer));
	}
});

describe('signInPath', () => {
	it('carries a safe destination, drops an unsafe one, and adds flags', () => {
		expect(signInPath('/w/boards')).toBe('/sign-in?redirectTo=%2Fw%2Fboards');
		expect(signInPath('/\t/evil.example')).toBe('/sign-in');
		expect(signInPath(null)).toBe('/sign-in');
		expect(signInPath('/invitations/x', { verified: '1' })).toBe('/sign-in?verified=1&redirectTo=%2Finvitations%2Fx');
	});
});
