// Page loads that run an analysis: the pool's refusals (422 too costly, 429 too many, 503 busy)
// become SvelteKit's error page with the same status and message, not a 500.
import { error } from '@sveltejs/kit';
import { ApiError } from '../http/errors';

export async function pageAnalysis<T>(load: () => Promise<T>): Promise<T> {
	try {
		return await load();
	} catch (e) {
		if (e instanceof ApiError) error(e.status, e.message);
		throw e;
	}
}
