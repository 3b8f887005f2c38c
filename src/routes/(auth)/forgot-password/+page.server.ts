// Asks better-auth to e-mail a reset link. The answer is the same whether or not the address
// has an account, so the form cannot be used to find out who has one.
import { auth } from '$lib/server/auth';
import { readForm } from '$lib/server/http/forms';
import { forgotPasswordSchema } from '$lib/schemas/auth';
import type { Actions } from './$types';

export const actions: Actions = {
	default: async ({ request }) => {
		const form = await readForm(request, forgotPasswordSchema, ['email']);
		if (!form.ok) return form.failure;
		await auth.api.requestPasswordReset({ body: { email: form.data.email, redirectTo: '/reset-password' } }).catch((error) => {
			console.error('[auth] password reset mail failed:', error);
		});
		return { sent: true, values: form.values };
	}
};
