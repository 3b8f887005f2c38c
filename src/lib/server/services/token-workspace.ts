// The workspace a new API token is bound to: the one named, which the caller must belong to with
// one of our roles (else 404 at the field, like any foreign id), or none for a personal token.
import { and, eq } from 'drizzle-orm';
import type { Database } from '../db';
import { member, organization } from '../db/schema';
import { ApiError } from '../http/errors';
import { can } from '../../authz';

export async function tokenWorkspace(db: Database, userId: string, workspaceId: string | null | undefined) {
	if (!workspaceId) return null;
	const [row] = await db
		.select({ id: organization.id, name: organization.name, role: member.role })
		.from(member)
		.innerJoin(organization, eq(organization.id, member.organizationId))
		.where(and(eq(member.organizationId, workspaceId), eq(member.userId, userId)))
		.limit(1);
	if (!row || !can(row.role, 'workspace.read')) throw new ApiError(404, 'not-found', 'workspace not found', { workspaceId: 'not a workspace you belong to' });
	return { id: row.id, name: row.name };
}
