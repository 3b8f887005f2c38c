// Templates of the workspace with a search (GET /api/v1/templates?q=, each with the rails that
// use it) and the rails a template could be applied to (GET /api/v1/rails), side by side; the
// caller's role comes with the layout's navigation data. A workspace the caller is not in
// answers 404, the error page.
import { can } from '$lib/authz';
import { apiLoad } from '$lib/client/api';
import type { Page, TemplateRow, WorkspaceRail } from '$lib/client/types';
import type { PageLoad } from './$types';

/** Most templates and rails the page lists. */
const TEMPLATES_SHOWN = 200;
const RAILS_SHOWN = 1000;

export const load: PageLoad = async ({ fetch, params, url, parent }) => {
	const ws = encodeURIComponent(params.workspace);
	const q = url.searchParams.get('q') ?? '';
	const search = q ? `&q=${encodeURIComponent(q)}` : '';
	const [templates, rails, nav] = await Promise.all([
		apiLoad<Page<TemplateRow>>(fetch, `/api/v1/templates?workspace=${ws}&limit=${TEMPLATES_SHOWN}${search}`, url),
		apiLoad<Page<WorkspaceRail>>(fetch, `/api/v1/rails?workspace=${ws}&limit=${RAILS_SHOWN}`, url),
		parent()
	]);
	const role = nav.me.workspaces.find((w) => w.id === params.workspace)?.role;
	return { q, templates: templates.items, rails: rails.items, canSave: can(role, 'loop.save') };
};
