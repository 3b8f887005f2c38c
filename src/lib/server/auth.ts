// The server's better-auth instance. The SvelteKit cookie plugin comes last so cookies set by
// auth calls inside form actions reach the browser (stack-notes).
import { getRequestEvent } from '$app/server';
import { sveltekitCookies } from 'better-auth/svelte-kit';
import { createAuth } from './auth-core';
import { db } from './db';

export const auth = createAuth(db, [sveltekitCookies(getRequestEvent)]);
