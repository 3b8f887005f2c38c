// The page the e-mailed link lands on (better-auth redirects here with ?token=, or with
// ?error=INVALID_TOKEN when the link is used up or expired). Sets the new password.
import { redirect } from '@sveltejs/kit';
import { auth } from '$lib/server/auth';
import { authFailure, readForm } from '$lib/server/http/forms';
import { resetPasswordSchema } from '$lib/schemas/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => ({
	token: url.searchParams.get('token') ?? '',
	invalid: url.searchParams.get('error') === 'INVALID_TOKEN'
});

export const actions: Actions = {
	default: async ({ request }) => {
		const form = await readForm(request, resetPasswordSchema);
		if (!form.ok) return form.failure;
		try {
			await auth.api.resetPassword({ body: { newPassword: form.data.password, token: form.data.token } });
		} catch (error) {
			return authFailure(error, {}, { INVALID_TOKEN: 'This link is used up or expired. Ask for a new one.' });
		}
		redirect(303, '/sign-in?reset=1');
	}
};
