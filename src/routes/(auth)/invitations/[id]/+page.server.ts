// The link in an invitation e-mail. Shows which workspace invites which address and as what;
// a signed-in user whose confirmed address it is accepts through better-auth's organization
// plugin (which, with our hook in auth-core.ts, refuses anyone else).
import { error, redirect } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { invitation, organization } from '$lib/server/db/schema';
import { authFailure } from '$lib/server/http/forms';
import { APP_HOME, signInPath } from '$lib/safeRedirect';
import type { Actions, PageServerLoad } from './$types';

async function find(id: string) {
	const [row] = await db
		.select({ id: invitation.id, email: invitation.email, role: invitation.role, status: invitation.status, expiresAt: invitation.expiresAt, workspaceId: organization.id, workspace: organization.name })
		.from(invitation)
		.innerJoin(organization, eq(organization.id, invitation.organizationId))
		.where(eq(invitation.id, id))
		.limit(1);
	return row ?? null;
}

export const load: PageServerLoad = async ({ params, locals, url }) => {
	const found = await find(params.id);
	if (!found) error(404, 'This invitation does not exist.');
	const usable = found.status === 'pending' && found.expiresAt > new Date();
	return {
		invitation: { email: found.email, role: found.role, workspace: found.workspace, status: usable ? 'pending' : found.status === 'pending' ? 'expired' : found.status },
		signedInAs: locals.user?.email ?? null,
		confirmed: Boolean(locals.user?.emailVerified),
		here: url.pathname
	};
};

export const actions: Actions = {
	accept: async ({ params, request, locals }) => {
		if (!locals.user) redirect(303, signInPath(`/invitations/${params.id}`));
		const found = await find(params.id);
		try {
			await auth.api.acceptInvitation({ body: { invitationId: params.id }, headers: request.headers });
		} catch (e) {
			return authFailure(e, {});
		}
		redirect(303, `${APP_HOME}/${found?.workspaceId ?? ''}`);
	}
};
