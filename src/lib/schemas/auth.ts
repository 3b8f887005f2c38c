// zod schemas of the sign-in, sign-up and password-reset forms (server actions and browser).
import { z } from 'zod';

export const MIN_PASSWORD = 10;

const email = z.email('enter an e-mail address').trim().toLowerCase();
const password = z.string().min(MIN_PASSWORD, `at least ${MIN_PASSWORD} characters`).max(128);

export const signInSchema = z.object({ email, password: z.string().min(1, 'enter your password') });
export const signUpSchema = z.object({ name: z.string().trim().min(1, 'enter your name').max(100), email, password });
export const forgotPasswordSchema = z.object({ email });
export const resetPasswordSchema = z
	.object({ token: z.string().min(1, 'the link is incomplete'), password, confirm: z.string() })
	.refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'the passwords differ' });

/** A script's first API token from e-mail and password (POST /api/v1/tokens/sign-in); the token fields are tokenCreateSchema's. */
export const tokenSignInSchema = z.object({ email, password: z.string().min(1, 'enter your password').max(128) });

/** The personal settings: the display name (PATCH /api/v1/me). */
export const profileSchema = z.object({ name: z.string().trim().min(1, 'enter your name').max(100, 'at most 100 characters') });

/** A password change from the settings page (POST /api/v1/me/password). */
export const passwordChangeSchema = z
	.object({
		currentPassword: z.string().min(1, 'enter your current password').max(128),
		newPassword: password,
		confirm: z.string(),
		/** Also revoke every API token of the account (when the password may have been known to someone else). */
		revokeTokens: z.boolean().default(false)
	})
	.refine((v) => v.newPassword === v.confirm, { path: ['confirm'], message: 'the passwords differ' });
