// The caller's review queue in this workspace (GET /api/v1/reviews?workspace=): revisions they
// were asked to sign off, then the others waiting in review. A workspace the caller is not in
// answers 404, the error page.
import { apiLoad } from '$lib/client/api';
import type { ReviewQueue } from '$lib/client/types';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ fetch, params, url }) => apiLoad<ReviewQueue>(fetch, `/api/v1/reviews?workspace=${encodeURIComponent(params.workspace)}`, url);
