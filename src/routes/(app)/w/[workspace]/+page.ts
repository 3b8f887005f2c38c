// A workspace's home: what waits for the caller here (GET /api/v1/home?workspace=). A workspace
// the caller is not in answers 404, which the page itself explains, so the error is kept as data.
import { api } from '$lib/client/api';
import type { HomeData } from '$lib/client/types';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ fetch, params }) => {
	const result = await api.get<HomeData>(`/api/v1/home?workspace=${encodeURIComponent(params.workspace)}`, fetch);
	return { home: result.ok ? result.data : null };
};
