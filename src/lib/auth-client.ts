// Browser client for better-auth's endpoints under /api/auth (sign-out, password reset request,
// workspace switching). Same origin, so no baseURL is needed.
import { createAuthClient } from 'better-auth/svelte';
import { organizationClient } from 'better-auth/client/plugins';

export const authClient = createAuthClient({ plugins: [organizationClient()] });
