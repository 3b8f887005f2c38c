// HTTP properties of POST /api/v1/analyze: a design document with one rule broken always
// answers 400 with the contract's error object naming that field; any other JSON value
// answers 400 with field errors; bodies that are not JSON or not sent as JSON answer 400/415.
// Never a 500, never an analysis of a broken document.
import '../support/env';
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { servedApp } from '../support/app';
import { signUp, type Client } from '../support/client';
import { buckDesign } from '../support/designs';
import { breakage, breakDocument, namesPath, validDesign } from '../../unit/property/designs';
import { propertyParams, propertyTimeout } from '../../unit/property/runs';

const app = servedApp();
let engineer: Client;

beforeAll(async () => {
	engineer = await signUp(app.origin, 'fuzzer');
});

describe('POST /api/v1/analyze with random invalid documents', () => {
	it('a document with one broken rule gets 400 and a field error on that path', async () => {
		await fc.assert(
			fc.asyncProperty(validDesign, breakage, async (doc, b) => {
				const reply = await engineer.post('/api/v1/analyze', breakDocument(doc, b));
				expect(reply.status, `${b.path} = ${JSON.stringify(b.value)}`).toBe(400);
				expect(reply.body.error.code).toBe('invalid-design');
				expect(namesPath(reply.body.error.fields, b.path), `${b.path} → ${JSON.stringify(reply.body.error.fields)}`).toBe(true);
			}),
			propertyParams(60)
		);
	}, propertyTimeout());

	it('any JSON value that is not a design gets 400 with field errors', async () => {
		await fc.assert(
			fc.asyncProperty(fc.jsonValue({ maxDepth: 3 }), async (value) => {
				const reply = await engineer.request('POST', '/api/v1/analyze', JSON.stringify(value), { 'content-type': 'application/json' });
				expect(reply.status, JSON.stringify(value).slice(0, 200)).toBe(400);
				expect(Object.keys(reply.body.error.fields ?? {}).length).toBeGreaterThan(0);
			}),
			propertyParams(40)
		);
	}, propertyTimeout());

	it('a body that is not JSON gets 400 invalid-json; one not sent as JSON gets 415', async () => {
		await fc.assert(
			fc.asyncProperty(fc.string({ minLength: 1, maxLength: 200 }), fc.constantFrom('text/plain', 'application/x-www-form-urlencoded', 'application/xml', ''), async (text, type) => {
				let isJson = true;
				try {
					JSON.parse(text);
				} catch {
					isJson = false;
				}
				if (!isJson) {
					const reply = await engineer.request('POST', '/api/v1/analyze', text, { 'content-type': 'application/json' });
					expect(reply.status).toBe(400);
					expect(reply.body.error.code).toBe('invalid-json');
				}
				if (type === 'application/x-www-form-urlencoded') return; // same-origin form posts are covered in cross-site.test.ts
				const other = await engineer.request('POST', '/api/v1/analyze', text, { 'content-type': type });
				expect(other.status, `content-type "${type}"`).toBe(415);
			}),
			propertyParams(30)
		);
	}, propertyTimeout());

	it('the unbroken document analyses (so the properties above are not refusing everything)', async () => {
		const reply = await engineer.post('/api/v1/analyze', buckDesign());
		expect(reply.status).toBe(200);
		expect(reply.body.metrics.phaseMarginDeg).toBeGreaterThan(0);
	});
});
