// The permission check for page loads: the same adapter as the API (authorize), with its
// ApiError turned into SvelteKit's error page (401 → sign-in redirect; 403 and 404 as pages).
import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import { signInPath } from '$lib/safeRedirect';
import { ApiError } from '../http/errors';
import { authorize, type Access } from './guard';
import type { Action } from '../../authz';

export async function authorizePage(event: RequestEvent, workspaceId: string, action: Action, what = 'page'): Promise<Access> {
	if (!event.locals.user) redirect(303, signInPath(event.url.pathname + event.url.search));
	try {
		return await authorize(event, workspaceId, action, what);
	} catch (e) {
		if (e instanceof ApiError) error(e.status, e.message);
		throw e;
	}
}
