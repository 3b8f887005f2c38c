// POST /api/v1/analyze: stateless analysis of a design document (contract v1). The body is
// the document itself; the answer is the engine's response, or 400 with the engine's field
// errors. Needs a signed-in caller (or token) but no workspace: nothing is stored. The analysis
// runs in the analysis pool (its budgets answer 422, 429 or 503; README, "Limits").
import * as analyses from '$lib/server/analysis-pool';
import { requireCaller } from '$lib/server/authz/guard';
import { endpoint, jsonText } from '$lib/server/http/endpoint';
import { readJson } from '$lib/server/http/request';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = endpoint(async (event) => {
	const caller = requireCaller(event);
	const answer = await analyses.analyzeJson(caller.userId, await readJson(event));
	return jsonText(answer.body, answer.status);
});
