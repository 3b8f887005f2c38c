// The one adapter between a request and the permission table: every /api/v1 handler calls
// `authorize(event, workspaceId, action)`. Signed out → 401; not a member of that workspace
// → 404 (another workspace's ids look exactly like ids that do not exist); role lacks the
// action → 403.
import type { RequestEvent } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { db } from '../db';
import { member } from '../db/schema';
import { ApiError, forbidden, notFound, unauthorized } from '../http/errors';
import { can, isRole, type Action, type Role } from '../../authz';

export interface Caller {
	userId: string;
	email: string;
	name: string;
}

export interface Access {
	caller: Caller;
	workspaceId: string;
	/** null when the member row holds a name that is not one of our roles. */
	role: Role | null;
}

export function requireCaller(event: RequestEvent): Caller {
	const user = event.locals.user;
	if (!user) throw unauthorized();
	return { userId: user.id, email: user.email, name: user.name };
}

export async function membershipRole(workspaceId: string, userId: string): Promise<string | null> {
	const [row] = await db
		.select({ role: member.role })
		.from(member)
		.where(and(eq(member.organizationId, workspaceId), eq(member.userId, userId)))
		.limit(1);
	return row?.role ?? null;
}

export async function authorize(event: RequestEvent, workspaceId: string, action: Action, what = 'resource'): Promise<Access> {
	const caller = requireCaller(event);
	// A token bound to one workspace sees every other workspace as nonexistent.
	if (!withinTokenScope(event, workspaceId)) throw notFound(what);
	const role = await membershipRole(workspaceId, caller.userId);
	if (role === null) throw notFound(what);
	if (!can(role, action)) throw forbidden(action);
	return { caller, workspaceId, role: isRole(role) ? role : null };
}

/** False when the request carries an API token bound to another workspace than `workspaceId`. */
export function withinTokenScope(event: RequestEvent, workspaceId: string): boolean {
	const bound = event.locals.tokenWorkspaceId;
	return !bound || bound === workspaceId;
}

/**
 * The workspace a collection request (list or create) addresses: `?workspace=` or the
 * `x-workspace-id` header, else the workspace the API token is bound to, else the session's active
 * workspace, else the caller's only one.
 */
export async function requestedWorkspaceId(event: RequestEvent): Promise<string> {
	const caller = requireCaller(event);
	const explicit = event.url.searchParams.get('workspace') ?? event.request.headers.get('x-workspace-id');
	if (explicit) return explicit;
	if (event.locals.tokenWorkspaceId) return event.locals.tokenWorkspaceId;
	const active = event.locals.session?.activeOrganizationId;
	if (active) return active;
	const rows = await db.select({ id: member.organizationId }).from(member).where(eq(member.userId, caller.userId)).limit(2);
	if (rows.length === 1) return rows[0].id;
	throw new ApiError(
		400,
		'workspace-required',
		rows.length === 0 ? 'you belong to no workspace yet' : 'name the workspace with ?workspace=<id> or the x-workspace-id header'
	);
}

/**
 * Authorizes an action on one stored row: 401 when signed out, 404 when the row does not
 * exist or lives in a workspace the caller is not in, 403 when the role lacks the action.
 */
export async function authorizeRow<T extends { workspaceId: string }>(
	event: RequestEvent,
	row: T | null,
	action: Action,
	what: string
): Promise<{ row: T; access: Access }> {
	requireCaller(event);
	if (!row) throw notFound(what);
	return { row, access: await authorize(event, row.workspaceId, action, what) };
}
