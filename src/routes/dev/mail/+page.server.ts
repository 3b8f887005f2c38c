// Development only: the messages the local fake SMTP server captured for the signed-in user's own,
// confirmed address, and no one else's: another user's reset or invitation link would be their
// account. Answers 404 in production (here and in the request guard).
import { error, redirect } from '@sveltejs/kit';
import { isProduction } from '$lib/server/env';
import { listCaptured, mailDir } from '$lib/server/mail/captured';
import { signInPath } from '$lib/safeRedirect';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (isProduction()) error(404, 'Not found');
	if (!locals.user) redirect(303, signInPath(url.pathname));
	// A session from before addresses were confirmed proves nothing about the mailbox.
	if (!locals.user.emailVerified) error(403, 'Confirm your e-mail address first; captured mail is shown only to its confirmed addressee.');
	return { mails: await listCaptured(200, locals.user.email), address: locals.user.email, folder: mailDir() };
};
