// Personal settings: who I am and my API tokens, from /api/v1.
import { apiLoad } from '$lib/client/api';
import type { Me, TokenRow } from '$lib/client/types';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ fetch, url, depends }) => {
	depends('app:settings');
	const [me, tokens] = await Promise.all([apiLoad<Me>(fetch, '/api/v1/me', url), apiLoad<{ items: TokenRow[] }>(fetch, '/api/v1/tokens', url)]);
	return { me, tokens: tokens.items };
};
