// POST /api/v1/analyze: stateless analysis of a design document (contract v1). The body is
// the document itself; the answer is the engine's response, or 400 with the engine's field
// errors. Needs a signed-in caller (or token) but no workspace: nothing is stored.
import { json } from '@sveltejs/kit';
import { analyzeDesign } from '$lib/engine/analyze';
import { requireCaller } from '$lib/server/authz/guard';
import { endpoint } from '$lib/server/http/endpoint';
import { readJson } from '$lib/server/http/request';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = endpoint(async (event) => {
	requireCaller(event);
	const result = analyzeDesign(await readJson(event));
	return 'error' in result ? json(result, { status: 400 }) : result;
});
