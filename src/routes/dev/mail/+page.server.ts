// Development only: the messages the local fake SMTP server captured (invitations, password
// resets), for owners. Answers 404 in production (here and in the request guard).
import { error, redirect } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { member } from '$lib/server/db/schema';
import { isProduction } from '$lib/server/env';
import { can } from '$lib/server/authz/permissions';
import { listCaptured, mailDir } from '$lib/server/mail/captured';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (isProduction()) error(404, 'Not found');
	if (!locals.user) redirect(303, `/sign-in?redirectTo=${encodeURIComponent(url.pathname)}`);
	const roles = await db.select({ role: member.role }).from(member).where(eq(member.userId, locals.user.id));
	if (!roles.some((r) => can(r.role, 'mail.readCaptured'))) error(403, 'Captured mail is for workspace owners.');
	return { mails: await listCaptured(200), folder: mailDir() };
};
