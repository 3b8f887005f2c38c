// Cross-site reads: the API never grants CORS to another site, so a page elsewhere can
// neither send JSON with the user's cookie (the preflight fails) nor read an answer. The
// cross-site form posts and better-auth's origin check are tested against the production
// build in tests/e2e/security.test.ts: the dev server these tests use turns both checks off
// (SvelteKit checks form origins only outside dev; better-auth skips it when NODE_ENV=test).
import '../support/env';
import { beforeAll, describe, expect, it } from 'vitest';
import { servedApp } from '../support/app';
import { signUp, type Client } from '../support/client';

const app = servedApp();
const EVIL = 'https://evil.example';
let user: Client;

beforeAll(async () => {
	user = await signUp(app.origin, 'cors');
});

describe('cross-site reads', () => {
	it('never grants CORS to another site', async () => {
		const preflight = await fetch(app.origin + '/api/v1/projects', {
			method: 'OPTIONS',
			headers: { origin: EVIL, 'access-control-request-method': 'POST', 'access-control-request-headers': 'content-type' }
		});
		expect(preflight.headers.get('access-control-allow-origin')).toBeNull();
		const read = await fetch(app.origin + '/api/v1/me', { headers: { origin: EVIL, cookie: user.cookie } });
		expect(read.headers.get('access-control-allow-origin')).toBeNull();
		expect(read.headers.get('access-control-allow-credentials')).toBeNull();
	});
});
