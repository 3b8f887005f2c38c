// See https://svelte.dev/docs/kit/types#app.d.ts
import type { auth } from '$lib/server/auth';

type AuthSession = typeof auth.$Infer.Session;

declare global {
	namespace App {
		interface Locals {
			/** Always set: null when signed out. */
			user: AuthSession['user'] | null;
			/** Always set: null when signed out or when the request authenticated with an API token. */
			session: AuthSession['session'] | null;
			/** How the caller proved who they are. */
			authenticatedBy: 'session' | 'token' | null;
			/** Always set: the one workspace the presenting API token may act in, else null (sessions, personal tokens). */
			tokenWorkspaceId: string | null;
		}
		interface Error {
			message: string;
			code?: string;
		}
	}
}

export {};
