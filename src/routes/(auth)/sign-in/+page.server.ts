// Sign-in with e-mail and password through better-auth (its cookie plugin sets the session).
// An account whose address is not confirmed yet gets no session: better-auth mails a fresh
// confirmation link instead, which signs the user in and continues to the same destination.
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { auth } from '$lib/server/auth';
import { authFailure, readForm, type FormErrors } from '$lib/server/http/forms';
import { signInSchema } from '$lib/schemas/auth';
import { safeRedirect, signInPath } from '$lib/safeRedirect';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeRedirect(url.searchParams.get('redirectTo')));
	const confirmation = url.searchParams.has('verified') ? (url.searchParams.has('error') ? 'expired' : 'confirmed') : null;
	return { reset: url.searchParams.has('reset'), confirmation };
};

export const actions: Actions = {
	default: async ({ request, url }) => {
		const form = await readForm(request, signInSchema, ['email']);
		if (!form.ok) return form.failure;
		const next = safeRedirect(url.searchParams.get('redirectTo'));
		try {
			// callbackURL: where the confirmation link mailed to an unconfirmed account leads.
			await auth.api.signInEmail({ body: { ...form.data, callbackURL: signInPath(next, { verified: '1' }) }, headers: request.headers });
		} catch (error) {
			if (error instanceof APIError && (error.body as { code?: string } | undefined)?.code === 'EMAIL_NOT_VERIFIED') {
				return fail(403, { unconfirmed: true, values: form.values, errors: { form: `Confirm your e-mail address first: we sent a new link to ${form.data.email}. It signs you in.` } as FormErrors });
			}
			return authFailure(error, form.values, { INVALID_EMAIL_OR_PASSWORD: 'That e-mail and password do not match an account.' });
		}
		redirect(303, next);
	}
};
