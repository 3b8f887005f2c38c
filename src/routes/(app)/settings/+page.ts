// Personal settings: who I am (the layout's /api/v1/me) and my API tokens, from /api/v1.
import { apiLoad } from '$lib/client/api';
import type { TokenRow } from '$lib/client/types';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ fetch, url, depends, parent }) => {
	depends('app:settings');
	const [{ me }, tokens] = await Promise.all([parent(), apiLoad<{ items: TokenRow[] }>(fetch, '/api/v1/tokens', url)]);
	return { me, tokens: tokens.items };
};
