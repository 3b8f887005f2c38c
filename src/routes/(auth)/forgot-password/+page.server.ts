// Asks better-auth to e-mail a reset link. The answer is the same whether or not the address
// has an account, so the form cannot be used to find out who has one.
import { auth } from '$lib/server/auth';
import { APIError } from 'better-auth/api';
import { authFailure, readForm } from '$lib/server/http/forms';
import { forgotPasswordSchema } from '$lib/schemas/auth';
import type { Actions } from './$types';

export const actions: Actions = {
	default: async ({ request }) => {
		const form = await readForm(request, forgotPasswordSchema, ['email']);
		if (!form.ok) return form.failure;
		try {
			// The request's headers carry the trusted client address the throttle counts by.
			await auth.api.requestPasswordReset({ body: { email: form.data.email, redirectTo: '/reset-password' }, headers: request.headers });
		} catch (error) {
			// Too many requests is said plainly (it is counted per e-mail and per client, whether or not an
			// account exists, so it tells nothing about accounts); any other failure stays silent.
			if (error instanceof APIError && error.statusCode === 429) return authFailure(error, form.values);
			console.error('[auth] password reset mail failed:', error);
		}
		return { sent: true, values: form.values };
	}
};
