// Public liveness probe: {"status":"ok","db":"up"}, or 503 with "db":"down". It reveals
// nothing but that, so it needs no role check.
import { json } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { databaseAnswers } from '$lib/server/health';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	const up = await databaseAnswers(db);
	return json(up ? { status: 'ok', db: 'up' } : { status: 'degraded', db: 'down' }, {
		status: up ? 200 : 503,
		headers: { 'cache-control': 'no-store' }
	});
};
