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

/** Where a signed-in user lands when no page asked for them: the signed-in area's root. */
export const APP_HOME = '/w';

/** Only same-site paths (never `//host` or absolute URLs), so a link cannot send users away. */
export function safeRedirect(value: string | null | undefined, fallback = APP_HOME): string {
	return value && value.startsWith('/') && !value.startsWith('//') && !value.startsWith('/\\') ? value : fallback;
}
