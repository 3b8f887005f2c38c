// Sign-in with e-mail and password through better-auth (its cookie plugin sets the session).
import { redirect } from '@sveltejs/kit';
import { auth } from '$lib/server/auth';
import { authFailure, readForm } from '$lib/server/http/forms';
import { safeRedirect, signInSchema } from '$lib/schemas/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeRedirect(url.searchParams.get('redirectTo')));
	return { reset: url.searchParams.has('reset') };
};

export const actions: Actions = {
	default: async ({ request, url }) => {
		const form = await readForm(request, signInSchema, ['email']);
		if (!form.ok) return form.failure;
		try {
			await auth.api.signInEmail({ body: form.data, headers: request.headers });
		} catch (error) {
			return authFailure(error, form.values, { INVALID_EMAIL_OR_PASSWORD: 'That e-mail and password do not match an account.' });
		}
		redirect(303, safeRedirect(url.searchParams.get('redirectTo')));
	}
};
