// better-auth's tables (core + organization plugin) in the Drizzle mysql shape its CLI emits:
// singular table names, snake_case columns, varchar(36) ids. Written to match
// `getSchema()` of better-auth 1.7.25 for our options; regenerate or re-check when plugins change.
// datetime(3) instead of timestamp: TIMESTAMP stops in 2038 and has MariaDB auto-update quirks.
import { relations } from 'drizzle-orm';
import { boolean, datetime, index, mysqlTable, text, varchar } from 'drizzle-orm/mysql-core';

const createdAt = () => datetime('created_at', { fsp: 3 }).$defaultFn(() => new Date()).notNull();
const updatedAt = () =>
	datetime('updated_at', { fsp: 3 })
		.$defaultFn(() => new Date())
		.$onUpdate(() => new Date())
		.notNull();

export const user = mysqlTable('user', {
	id: varchar('id', { length: 36 }).primaryKey(),
	name: varchar('name', { length: 255 }).notNull(),
	email: varchar('email', { length: 255 }).notNull().unique(),
	emailVerified: boolean('email_verified').default(false).notNull(),
	image: text('image'),
	createdAt: createdAt(),
	updatedAt: updatedAt()
});

export const session = mysqlTable(
	'session',
	{
		id: varchar('id', { length: 36 }).primaryKey(),
		expiresAt: datetime('expires_at', { fsp: 3 }).notNull(),
		token: varchar('token', { length: 255 }).notNull().unique(),
		createdAt: createdAt(),
		updatedAt: updatedAt(),
		ipAddress: text('ip_address'),
		userAgent: text('user_agent'),
		userId: varchar('user_id', { length: 36 })
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		activeOrganizationId: varchar('active_organization_id', { length: 36 })
	},
	(table) => [index('session_userId_idx').on(table.userId)]
);

export const account = mysqlTable(
	'account',
	{
		id: varchar('id', { length: 36 }).primaryKey(),
		accountId: text('account_id').notNull(),
		providerId: text('provider_id').notNull(),
		userId: varchar('user_id', { length: 36 })
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		accessToken: text('access_token'),
		refreshToken: text('refresh_token'),
		idToken: text('id_token'),
		accessTokenExpiresAt: datetime('access_token_expires_at', { fsp: 3 }),
		refreshTokenExpiresAt: datetime('refresh_token_expires_at', { fsp: 3 }),
		scope: text('scope'),
		password: text('password'),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(table) => [index('account_userId_idx').on(table.userId)]
);

export const verification = mysqlTable(
	'verification',
	{
		id: varchar('id', { length: 36 }).primaryKey(),
		identifier: varchar('identifier', { length: 255 }).notNull(),
		value: text('value').notNull(),
		expiresAt: datetime('expires_at', { fsp: 3 }).notNull(),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(table) => [index('verification_identifier_idx').on(table.identifier)]
);

export const organization = mysqlTable(
	'organization',
	{
		id: varchar('id', { length: 36 }).primaryKey(),
		name: varchar('name', { length: 255 }).notNull(),
		slug: varchar('slug', { length: 255 }).notNull().unique(),
		logo: text('logo'),
		createdAt: datetime('created_at', { fsp: 3 }).notNull(),
		metadata: text('metadata')
	},
	(table) => [index('organization_slug_idx').on(table.slug)]
);

export const member = mysqlTable(
	'member',
	{
		id: varchar('id', { length: 36 }).primaryKey(),
		organizationId: varchar('organization_id', { length: 36 })
			.notNull()
			.references(() => organization.id, { onDelete: 'cascade' }),
		userId: varchar('user_id', { length: 36 })
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		role: varchar('role', { length: 255 }).default('member').notNull(),
		createdAt: datetime('created_at', { fsp: 3 }).notNull()
	},
	(table) => [
		index('member_organizationId_idx').on(table.organizationId),
		index('member_userId_idx').on(table.userId)
	]
);

export const invitation = mysqlTable(
	'invitation',
	{
		id: varchar('id', { length: 36 }).primaryKey(),
		organizationId: varchar('organization_id', { length: 36 })
			.notNull()
			.references(() => organization.id, { onDelete: 'cascade' }),
		email: varchar('email', { length: 255 }).notNull(),
		role: varchar('role', { length: 255 }),
		status: varchar('status', { length: 255 }).default('pending').notNull(),
		expiresAt: datetime('expires_at', { fsp: 3 }).notNull(),
		createdAt: createdAt(),
		inviterId: varchar('inviter_id', { length: 36 })
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' })
	},
	(table) => [
		index('invitation_organizationId_idx').on(table.organizationId),
		index('invitation_email_idx').on(table.email)
	]
);

export const userRelations = relations(user, ({ many }) => ({
	sessions: many(session),
	accounts: many(account),
	members: many(member),
	invitations: many(invitation)
}));

export const sessionRelations = relations(session, ({ one }) => ({
	user: one(user, { fields: [session.userId], references: [user.id] })
}));

export const accountRelations = relations(account, ({ one }) => ({
	user: one(user, { fields: [account.userId], references: [user.id] })
}));

export const organizationRelations = relations(organization, ({ many }) => ({
	members: many(member),
	invitations: many(invitation)
}));

export const memberRelations = relations(member, ({ one }) => ({
	organization: one(organization, { fields: [member.organizationId], references: [organization.id] }),
	user: one(user, { fields: [member.userId], references: [user.id] })
}));

export const invitationRelations = relations(invitation, ({ one }) => ({
	organization: one(organization, { fields: [invitation.organizationId], references: [organization.id] }),
	user: one(user, { fields: [invitation.inviterId], references: [user.id] })
}));
