// Account creation with e-mail and password; the new user is signed in straight away.
import { redirect } from '@sveltejs/kit';
import { auth } from '$lib/server/auth';
import { authFailure, readForm } from '$lib/server/http/forms';
import { safeRedirect, signUpSchema } from '$lib/schemas/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeRedirect(url.searchParams.get('redirectTo')));
};

export const actions: Actions = {
	default: async ({ request, url }) => {
		const form = await readForm(request, signUpSchema, ['name', 'email']);
		if (!form.ok) return form.failure;
		try {
			await auth.api.signUpEmail({ body: form.data, headers: request.headers });
		} catch (error) {
			return authFailure(error, form.values, {
				USER_ALREADY_EXISTS: 'An account with this e-mail exists already. Sign in instead.',
				USER_ALREADY_EXISTS_USE_ANOTHER_EMAIL: 'An account with this e-mail exists already. Sign in instead.'
			});
		}
		redirect(303, safeRedirect(url.searchParams.get('redirectTo')));
	}
};
