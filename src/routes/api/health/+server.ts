// Public liveness probe: {"status":"ok","db":"up","analyses":{threads,running,waiting}}, or 503
// with "db":"down". It reveals nothing but that (no user, design or figure), so it needs no
// role check. It never waits for an analysis: they run in the pool's worker threads.
import { json } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { databaseAnswers } from '$lib/server/health';
import { poolStats } from '$lib/server/analysis-pool';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	const [up, analyses] = await Promise.all([databaseAnswers(db), poolStats()]);
	return json(up ? { status: 'ok', db: 'up', analyses } : { status: 'degraded', db: 'down', analyses }, {
		status: up ? 200 : 503,
		headers: { 'cache-control': 'no-store' }
	});
};
