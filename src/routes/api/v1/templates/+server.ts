// GET /api/v1/templates?workspace=&q=: the workspace's compensator strategies, paged, those
// matching `q` (name, description, topology or network kind) when given, each with `rails`: the
// rails whose latest revision was placed from it. POST: add one (owner, engineer).
import { z } from 'zod';
import { db } from '$lib/server/db';
import { authorize, requestedWorkspaceId } from '$lib/server/authz/guard';
import { created, endpoint } from '$lib/server/http/endpoint';
import { pageQuery, parseBody, parseQuery } from '$lib/server/http/request';
import { templateSchema } from '$lib/schemas/workspace';
import * as templates from '$lib/server/services/templates';
import { usage } from '$lib/server/services/template-use';
import type { RequestHandler } from './$types';

const templateQuery = pageQuery.extend({ q: z.string().max(200).optional() });

export const GET: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'template.read', 'workspace');
	const { q, ...page } = parseQuery(event, templateQuery);
	const found = await templates.list(db, access.workspaceId, page, q);
	const used = found.items.length ? await usage(db, access.workspaceId, found.items.map((t) => t.id)) : {};
	return { ...found, items: found.items.map((t) => ({ ...t, rails: used[t.id] ?? [] })) };
});

export const POST: RequestHandler = endpoint(async (event) => {
	const access = await authorize(event, await requestedWorkspaceId(event), 'template.create', 'workspace');
	const input = await parseBody(event, templateSchema);
	return created(await templates.create(db, access.caller, access.workspaceId, input));
});
