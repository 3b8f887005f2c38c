// Templates of the workspace with a search, the rails that use each, and the rails a template
// could be applied to (same workspace). Applying goes through /api/v1/templates/{id}/apply.
import { asc, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { project, rail } from '$lib/server/db/schema';
import { authorizePage } from '$lib/server/authz/page';
import { can } from '$lib/authz';
import { search } from '$lib/server/services/template-use';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const ws = event.params.workspace;
	const access = await authorizePage(event, ws, 'template.read', 'workspace');
	const q = event.url.searchParams.get('q') ?? '';
	const [templates, rails] = await Promise.all([
		search(db, ws, q),
		db
			.select({ id: rail.id, name: rail.name, topology: rail.topology, fsw: rail.fsw, projectId: project.id, projectName: project.name })
			.from(rail)
			.innerJoin(project, eq(project.id, rail.projectId))
			.where(eq(rail.workspaceId, ws))
			.orderBy(asc(project.name), asc(rail.name))
	]);
	return { q, templates: JSON.parse(JSON.stringify(templates)) as typeof templates, rails, canSave: can(access.role, 'loop.save') };
};
