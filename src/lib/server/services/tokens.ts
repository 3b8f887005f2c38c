// Personal API tokens: `lw_` + 32 random bytes (base64url), shown once at creation. Only the
// SHA-256 is stored, so a leaked database does not leak usable tokens. A token acts as its
// owner (with the owner's role in whichever workspace a request addresses) until revoked.
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { and, desc, eq, gt, isNull, or } from 'drizzle-orm';
import type { Database } from '../db';
import { apiToken, user } from '../db/schema';

export const TOKEN_PREFIX = 'lw_';

const sha256 = (value: string) => createHash('sha256').update(value).digest('hex');

const publicColumns = {
	id: apiToken.id,
	name: apiToken.name,
	prefix: apiToken.prefix,
	createdAt: apiToken.createdAt,
	lastUsedAt: apiToken.lastUsedAt,
	expiresAt: apiToken.expiresAt,
	revokedAt: apiToken.revokedAt
};

export async function create(db: Database, userId: string, input: { name: string; expiresInDays?: number | null }) {
	const token = TOKEN_PREFIX + randomBytes(32).toString('base64url');
	const row = {
		id: randomUUID(),
		userId,
		name: input.name,
		prefix: token.slice(0, 10),
		tokenHash: sha256(token),
		createdAt: new Date(),
		expiresAt: input.expiresInDays ? new Date(Date.now() + input.expiresInDays * 86_400_000) : null
	};
	await db.insert(apiToken).values(row);
	const { tokenHash: _hash, userId: _user, ...shown } = row;
	return { ...shown, lastUsedAt: null, revokedAt: null, token };
}

export function list(db: Database, userId: string) {
	return db.select(publicColumns).from(apiToken).where(eq(apiToken.userId, userId)).orderBy(desc(apiToken.createdAt));
}

/** Marks the token revoked; false when the caller owns no such token. */
export async function revoke(db: Database, userId: string, tokenId: string): Promise<boolean> {
	const [result] = await db
		.update(apiToken)
		.set({ revokedAt: new Date() })
		.where(and(eq(apiToken.id, tokenId), eq(apiToken.userId, userId), isNull(apiToken.revokedAt)));
	return result.affectedRows > 0;
}

/** Revokes every live token of the user (a password reset: whoever had the account may hold one); answers how many. */
export async function revokeAll(db: Database, userId: string): Promise<number> {
	const [result] = await db.update(apiToken).set({ revokedAt: new Date() }).where(and(eq(apiToken.userId, userId), isNull(apiToken.revokedAt)));
	return result.affectedRows;
}

/** The user a presented token belongs to, or null when it is unknown, revoked or expired. */
export async function authenticate(db: Database, token: string) {
	if (!token.startsWith(TOKEN_PREFIX)) return null;
	const now = new Date();
	const [row] = await db
		.select({ tokenId: apiToken.id, user })
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
	return row.user;
}
