// Account creation with e-mail and password. No session yet: better-auth mails a confirmation
// link, which confirms the address, signs the user in and continues to where they were going
// (through the sign-in page, which also explains a used-up link). The answer is the same whether
// or not the address has an account (an existing owner gets a note by mail instead), so the form
// cannot be used to find out who has one.
import { redirect } from '@sveltejs/kit';
import { auth } from '$lib/server/auth';
import { isProduction } from '$lib/server/env';
import { authFailure, readForm } from '$lib/server/http/forms';
import { signUpSchema } from '$lib/schemas/auth';
import { safeRedirect, signInPath } from '$lib/safeRedirect';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeRedirect(url.searchParams.get('redirectTo')));
	// Development mail never leaves the machine; the page says where to read it.
	return { capturedMail: !isProduction() };
};

export const actions: Actions = {
	default: async ({ request, url }) => {
		const form = await readForm(request, signUpSchema, ['name', 'email']);
		if (!form.ok) return form.failure;
		const next = safeRedirect(url.searchParams.get('redirectTo'));
		try {
			await auth.api.signUpEmail({ body: { ...form.data, callbackURL: signInPath(next, { verified: '1' }) }, headers: request.headers });
		} catch (error) {
			return authFailure(error, form.values);
		}
		return { sent: true, email: form.data.email, values: form.values };
	}
};
