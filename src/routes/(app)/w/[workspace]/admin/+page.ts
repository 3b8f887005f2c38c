// The owner's administration page: members, invitations and the workspace's API tokens, each
// from its /api/v1 route (a role without the right answers 403, shown as the error page).
import { apiLoad } from '$lib/client/api';
import type { InvitationRow, MemberRow, TokenRow } from '$lib/client/types';
import type { PageLoad } from './$types';

export const load: PageLoad = async ({ fetch, params, url, depends }) => {
	depends('app:workspace-admin');
	const base = `/api/v1/workspaces/${encodeURIComponent(params.workspace)}`;
	const [members, invitations, tokens] = await Promise.all([
		apiLoad<{ items: MemberRow[] }>(fetch, `${base}/members`, url),
		apiLoad<{ items: InvitationRow[] }>(fetch, `${base}/invitations`, url),
		apiLoad<{ items: TokenRow[] }>(fetch, `${base}/tokens`, url)
	]);
	return { members: members.items, invitations: invitations.items, tokens: tokens.items };
};
