// API tokens: `lw_` + 32 random bytes (base64url), shown once at creation. Only the SHA-256 is
// stored, so a leaked database does not leak usable tokens. A token acts as its user (with the
// user's role in whichever workspace a request addresses) until revoked or expired. A token bound
// to a workspace acts only there, and that workspace's owners can list and revoke it; a personal
// token (no workspace) acts in every workspace of its user and only the user can revoke it.
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { and, desc, eq, gt, isNull, or } from 'drizzle-orm';
import type { Database } from '../db';
import { apiToken, organization, user } from '../db/schema';
import * as audit from './audit';
import type { Actor } from './types';

export const TOKEN_PREFIX = 'lw_';

/** Longest list answer: a user or a workspace with more live tokens than this is not a real case. */
export const TOKEN_LIST_LIMIT = 200;

const sha256 = (value: string) => createHash('sha256').update(value).digest('hex');

const publicColumns = {
	id: apiToken.id,
	name: apiToken.name,
	prefix: apiToken.prefix,
	workspaceId: apiToken.workspaceId,
	workspaceName: organization.name,
	createdAt: apiToken.createdAt,
	lastUsedAt: apiToken.lastUsedAt,
	expiresAt: apiToken.expiresAt,
	revokedAt: apiToken.revokedAt
};

export type TokenRow = typeof apiToken.$inferSelect;

export async function create(
	db: Database,
	userId: string,
	input: { name: string; expiresInDays?: number | null; workspace?: { id: string; name: string } | null }
) {
	const token = TOKEN_PREFIX + randomBytes(32).toString('base64url');
	const row = {
		id: randomUUID(),
		userId,
		workspaceId: input.workspace?.id ?? null,
		name: input.name,
		prefix: token.slice(0, 10),
		tokenHash: sha256(token),
		createdAt: new Date(),
		expiresAt: input.expiresInDays ? new Date(Date.now() + input.expiresInDays * 86_400_000) : null
	};
	await db.insert(apiToken).values(row);
	const { tokenHash: _hash, userId: _user, ...shown } = row;
	return { ...shown, workspaceName: input.workspace?.name ?? null, lastUsedAt: null, revokedAt: null, token };
}

/** The user's own tokens, newest first. */
export function list(db: Database, userId: string) {
	return db
		.select(publicColumns)
		.from(apiToken)
		.leftJoin(organization, eq(organization.id, apiToken.workspaceId))
		.where(eq(apiToken.userId, userId))
		.orderBy(desc(apiToken.createdAt))
		.limit(TOKEN_LIST_LIMIT);
}

/** Tokens bound to a workspace, with whose they are (an owner's view), newest first. */
export function listForWorkspace(db: Database, workspaceId: string) {
	return db
		.select({ ...publicColumns, userId: apiToken.userId, userName: user.name, userEmail: user.email })
		.from(apiToken)
		.innerJoin(user, eq(user.id, apiToken.userId))
		.leftJoin(organization, eq(organization.id, apiToken.workspaceId))
		.where(eq(apiToken.workspaceId, workspaceId))
		.orderBy(desc(apiToken.createdAt))
		.limit(TOKEN_LIST_LIMIT);
}

/** Marks the token revoked; false when the caller owns no such live token. */
export async function revoke(db: Database, userId: string, tokenId: string): Promise<boolean> {
	const [result] = await db
		.update(apiToken)
		.set({ revokedAt: new Date() })
		.where(and(eq(apiToken.id, tokenId), eq(apiToken.userId, userId), isNull(apiToken.revokedAt)));
	return result.affectedRows > 0;
}

/**
 * An owner revokes a token bound to their workspace, whoever's it is; recorded in the audit trail.
 * False when the workspace has no such live token (another workspace's token, a personal one).
 */
export async function revokeInWorkspace(db: Database, actor: Actor, workspaceId: string, tokenId: string): Promise<boolean> {
	return db.transaction(async (tx) => {
		const [row] = await tx
			.select({ id: apiToken.id, userId: apiToken.userId, name: apiToken.name })
			.from(apiToken)
			.where(and(eq(apiToken.id, tokenId), eq(apiToken.workspaceId, workspaceId), isNull(apiToken.revokedAt)))
			.limit(1)
			.for('update');
		if (!row) return false;
		await tx.update(apiToken).set({ revokedAt: new Date() }).where(eq(apiToken.id, row.id));
		await audit.record(tx, {
			workspaceId,
			actor,
			action: 'token.revoke',
			entityType: 'api-token',
			entityId: row.id,
			before: { userId: row.userId, name: row.name }
		});
		return true;
	});
}

/** Revokes every live token of the user (a password reset: whoever had the account may hold one); answers how many. */
export async function revokeAll(db: Database, userId: string): Promise<number> {
	const [result] = await db.update(apiToken).set({ revokedAt: new Date() }).where(and(eq(apiToken.userId, userId), isNull(apiToken.revokedAt)));
	return result.affectedRows;
}

/** The user a presented token belongs to and the workspace it is bound to, or null when it is unknown, revoked or expired. */
export async function authenticate(db: Database, token: string) {
	if (!token.startsWith(TOKEN_PREFIX)) return null;
	const now = new Date();
	const [row] = await db
		.select({ tokenId: apiToken.id, workspaceId: apiToken.workspaceId, user })
		.from(apiToken)
		.innerJoin(user, eq(user.id, apiToken.userId))
		.where(
			and(
				eq(apiToken.tokenHash, sha256(token)),
				isNull(apiToken.revokedAt),
				or(isNull(apiToken.expiresAt), gt(apiToken.expiresAt, now))
			)
		)
		.limit(1);
	if (!row) return null;
	await db.update(apiToken).set({ lastUsedAt: now }).where(eq(apiToken.id, row.tokenId));
	return { user: row.user, workspaceId: row.workspaceId };
}
