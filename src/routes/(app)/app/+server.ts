// /app is an older name for the signed-in home; the home is /w (APP_HOME).
import { redirect } from '@sveltejs/kit';
import { APP_HOME } from '$lib/safeRedirect';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = () => redirect(307, APP_HOME);
