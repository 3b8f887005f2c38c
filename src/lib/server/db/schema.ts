// Application tables. Singular names and snake_case columns, matching better-auth's tables,
// which are generated into auth-schema.ts and re-exported here. A workspace is better-auth's
// `organization`; every app row carries `workspace_id` so isolation is one equality check.
import { relations, sql } from 'drizzle-orm';
import {
	bigint,
	datetime,
	double,
	index,
	int,
	json,
	mysqlEnum,
	mysqlTable,
	text,
	uniqueIndex,
	varchar
} from 'drizzle-orm/mysql-core';
import { organization, user } from './auth-schema';
import type { Verification } from '../../engine/verify/types';
import type { VerdictHeadline } from '../../verdict/figures';
import type { StoredSwitchingCheck } from '../../verdict/switchingText';
import type { MarginTargets, RailTolerances, VerdictFlag } from '../services/types';

export * from './auth-schema';

/** Records that the demo seed ran, so `npm start` seeds once and never duplicates. */
export const seedMark = mysqlTable('seed_mark', {
	id: int('id').autoincrement().primaryKey(),
	name: varchar('name', { length: 64 }).notNull().unique(),
	appliedAt: datetime('applied_at', { fsp: 3 }).notNull()
});

const id = () => varchar('id', { length: 36 }).primaryKey();
const workspaceId = () =>
	varchar('workspace_id', { length: 36 })
		.notNull()
		.references(() => organization.id, { onDelete: 'cascade' });
const createdAt = () => datetime('created_at', { fsp: 3 }).$defaultFn(() => new Date()).notNull();
const updatedAt = () =>
	datetime('updated_at', { fsp: 3 })
		.$defaultFn(() => new Date())
		.$onUpdate(() => new Date())
		.notNull();

/** Per-workspace settings: the margin targets every rail uses unless it overrides them. */
export const workspaceSetting = mysqlTable('workspace_setting', {
	workspaceId: varchar('workspace_id', { length: 36 })
		.primaryKey()
		.references(() => organization.id, { onDelete: 'cascade' }),
	marginTargets: json('margin_targets').$type<MarginTargets>().notNull(),
	updatedAt: updatedAt()
});

/** A project: one board or product. */
export const project = mysqlTable(
	'project',
	{
		id: id(),
		workspaceId: workspaceId(),
		name: varchar('name', { length: 120 }).notNull(),
		description: text('description'),
		createdBy: varchar('created_by', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [uniqueIndex('project_workspace_name_uq').on(t.workspaceId, t.name)]
);

/** A regulator output on a board, with its operating point, corners and targets. */
export const rail = mysqlTable(
	'rail',
	{
		id: id(),
		workspaceId: workspaceId(),
		projectId: varchar('project_id', { length: 36 })
			.notNull()
			.references(() => project.id, { onDelete: 'cascade' }),
		name: varchar('name', { length: 64 }).notNull(),
		topology: mysqlEnum('topology', ['buck', 'boost']).notNull(),
		vout: double('vout').notNull(),
		vinNom: double('vin_nom').notNull(),
		vinMin: double('vin_min').notNull(),
		vinMax: double('vin_max').notNull(),
		ioutNom: double('iout_nom').notNull(),
		ioutMin: double('iout_min').notNull(),
		ioutMax: double('iout_max').notNull(),
		fsw: double('fsw').notNull(),
		tolerances: json('tolerances').$type<RailTolerances>().notNull(),
		/** null: the workspace's targets apply. */
		marginTargets: json('margin_targets').$type<MarginTargets | null>(),
		notes: text('notes'),
		/**
		 * Set when re-verification (an engine change, or a change of the template the rail's
		 * network came from) changed the verdict of its latest revision; cleared when someone
		 * acknowledges it or saves a new revision.
		 */
		verdictFlag: json('verdict_flag').$type<VerdictFlag | null>(),
		createdBy: varchar('created_by', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [uniqueIndex('rail_project_name_uq').on(t.projectId, t.name), index('rail_workspace_idx').on(t.workspaceId)]
);

export const LOOP_STATUSES = ['draft', 'in-review', 'approved', 'changes-requested'] as const;
export type LoopStatus = (typeof LOOP_STATUSES)[number];

/**
 * One saved revision of a rail's loop. Append-only: a new design is a new row with the next
 * `revision` number; only the review status of a row changes afterwards.
 */
export const loopRevision = mysqlTable(
	'loop_revision',
	{
		id: id(),
		workspaceId: workspaceId(),
		railId: varchar('rail_id', { length: 36 })
			.notNull()
			.references(() => rail.id, { onDelete: 'cascade' }),
		revision: int('revision').notNull(),
		schemaVersion: int('schema_version').notNull(),
		/** The design document with its whole verification spec (targets, corners, tolerances, spread). */
		design: json('design').$type<Record<string, unknown>>().notNull(),
		/**
		 * The engine's verdict on `design`, computed at save (engine/verify); every screen, export
		 * and API answer reads it. Null only for rows written before it existed, until the data
		 * step of scripts/migrate.ts fills them.
		 */
		verification: json('verification').$type<Verification | null>(),
		/**
		 * The verdict's headline (status, summary, rows, targets, worst figures, corner counts,
		 * spread), written by the database from `verification` whenever that is written: ~3 kB of
		 * the ~80 kB verdict, so the board table reads every rail's verdict without parsing the
		 * corner lists. Never written by the app; one definition, the stored verdict.
		 */
		verdictHeadline: json('verdict_headline')
			.$type<VerdictHeadline | null>()
			.generatedAlwaysAs(
				sql.raw(
					"IF(`verification` IS NULL, NULL, JSON_OBJECT('engineVersion', JSON_EXTRACT(`verification`, '$.engineVersion'), 'status', JSON_EXTRACT(`verification`, '$.status'), 'summary', JSON_EXTRACT(`verification`, '$.summary'), 'rows', JSON_EXTRACT(`verification`, '$.rows'), 'targets', JSON_EXTRACT(`verification`, '$.targets'), 'worst', JSON_EXTRACT(`verification`, '$.worst'), 'corners', JSON_OBJECT('mode', JSON_EXTRACT(`verification`, '$.corners.mode'), 'count', JSON_EXTRACT(`verification`, '$.corners.count'), 'unstable', JSON_EXTRACT(`verification`, '$.corners.unstable'), 'failed', JSON_EXTRACT(`verification`, '$.corners.failed')), 'spread', JSON_EXTRACT(`verification`, '$.spread')))"
				),
				{ mode: 'stored' }
			),
		/**
		 * The switching check of `design` (engine/switching: PM and fc measured on the switched
		 * circuit beside the averaged ones), run in the analysis pool when a member asks for it and
		 * kept with the revision with its own engine version; null until then.
		 */
		switchingCheck: json('switching_check').$type<StoredSwitchingCheck | null>(),
		/** ENGINE_VERSION that computed `verification`; `npm run reverify` recomputes older ones. */
		engineVersion: varchar('engine_version', { length: 32 }),
		message: varchar('message', { length: 500 }).notNull(),
		status: mysqlEnum('status', LOOP_STATUSES).notNull().default('draft'),
		authorId: varchar('author_id', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		statusChangedAt: datetime('status_changed_at', { fsp: 3 }),
		statusChangedBy: varchar('status_changed_by', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		/** The template this revision's network was placed from (templates.apply), for "which rails use it". */
		templateId: varchar('template_id', { length: 36 }).references(() => template.id, { onDelete: 'set null' })
	},
	(t) => [uniqueIndex('loop_rail_revision_uq').on(t.railId, t.revision), index('loop_workspace_idx').on(t.workspaceId)]
);

/** Review conversation on one loop revision (comments and sign-off notes). */
export const loopComment = mysqlTable(
	'loop_comment',
	{
		id: id(),
		workspaceId: workspaceId(),
		loopId: varchar('loop_id', { length: 36 })
			.notNull()
			.references(() => loopRevision.id, { onDelete: 'cascade' }),
		authorId: varchar('author_id', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		body: text('body').notNull(),
		/** A comment pinned to a frequency on the plot, Hz; null for a general remark. */
		freqHz: double('freq_hz'),
		createdAt: createdAt()
	},
	(t) => [index('loop_comment_loop_idx').on(t.loopId)]
);

/** A workspace-shared compensator strategy (kind, placement target, part series). */
export const template = mysqlTable(
	'template',
	{
		id: id(),
		workspaceId: workspaceId(),
		name: varchar('name', { length: 120 }).notNull(),
		description: text('description'),
		topology: mysqlEnum('topology', ['buck', 'boost']),
		compensator: json('compensator').$type<Record<string, unknown>>().notNull(),
		createdBy: varchar('created_by', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [uniqueIndex('template_workspace_name_uq').on(t.workspaceId, t.name)]
);

export const REVIEW_REQUEST_STATUSES = ['pending', 'approved', 'changes-requested', 'superseded'] as const;
export type ReviewRequestStatus = (typeof REVIEW_REQUEST_STATUSES)[number];

/**
 * A request for one reviewer to sign off one loop revision. The revision's own status says
 * where the sign-off stands; this row says who was asked, by whom, and what they answered.
 * `superseded`: another reviewer decided first.
 */
export const reviewRequest = mysqlTable(
	'review_request',
	{
		id: id(),
		workspaceId: workspaceId(),
		loopId: varchar('loop_id', { length: 36 })
			.notNull()
			.references(() => loopRevision.id, { onDelete: 'cascade' }),
		reviewerId: varchar('reviewer_id', { length: 36 })
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		requestedBy: varchar('requested_by', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		status: mysqlEnum('status', REVIEW_REQUEST_STATUSES).notNull().default('pending'),
		note: text('note'),
		createdAt: createdAt(),
		decidedAt: datetime('decided_at', { fsp: 3 })
	},
	(t) => [uniqueIndex('review_request_loop_reviewer_uq').on(t.loopId, t.reviewerId), index('review_request_reviewer_idx').on(t.reviewerId, t.status)]
);

/** What a stored bench file holds: canonical arrays (Hz ascending, dB, unwrapped degrees). */
export interface BenchSeries {
	freqHz: number[];
	magDb: number[];
	phaseDeg: number[];
}

/**
 * A measured Bode file (loop gain or plant) uploaded under a rail, parsed on upload and stored
 * in canonical form with its metadata (conditions, instrument, injection point, date) and how
 * the parser read it (separator, units, header line), so the original units stay visible.
 */
export const benchFile = mysqlTable(
	'bench_file',
	{
		id: id(),
		workspaceId: workspaceId(),
		railId: varchar('rail_id', { length: 36 })
			.notNull()
			.references(() => rail.id, { onDelete: 'cascade' }),
		fileName: varchar('file_name', { length: 255 }).notNull(),
		kind: mysqlEnum('kind', ['loop', 'plant']).notNull(),
		metadata: json('metadata').$type<Record<string, unknown>>().notNull(),
		series: json('series').$type<BenchSeries>().notNull(),
		format: json('format').$type<Record<string, unknown>>().notNull(),
		parseNotes: json('parse_notes').$type<string[]>().notNull(),
		points: int('points').notNull(),
		sizeBytes: int('size_bytes').notNull(),
		uploadedBy: varchar('uploaded_by', { length: 36 }).references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [index('bench_file_rail_idx').on(t.railId)]
);

/**
 * Every write, who did it and what changed. No foreign keys on purpose: the trail outlives
 * the rows (and users) it describes. `before`/`after` hold small summaries, not whole documents.
 */
export const auditLog = mysqlTable(
	'audit_log',
	{
		id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
		workspaceId: varchar('workspace_id', { length: 36 }).notNull(),
		actorId: varchar('actor_id', { length: 36 }),
		actorEmail: varchar('actor_email', { length: 255 }),
		action: varchar('action', { length: 64 }).notNull(),
		entityType: varchar('entity_type', { length: 32 }).notNull(),
		entityId: varchar('entity_id', { length: 36 }).notNull(),
		before: json('before').$type<Record<string, unknown> | null>(),
		after: json('after').$type<Record<string, unknown> | null>(),
		createdAt: createdAt()
	},
	(t) => [index('audit_workspace_time_idx').on(t.workspaceId, t.createdAt)]
);

/** Personal API tokens for scripts and CI. Only a SHA-256 of the secret is stored. */
export const apiToken = mysqlTable(
	'api_token',
	{
		id: id(),
		userId: varchar('user_id', { length: 36 })
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		/**
		 * The one workspace the token may act in (its owners can see and revoke it); null: a personal
		 * token that acts in every workspace of its user, which only the user can revoke.
		 */
		workspaceId: varchar('workspace_id', { length: 36 }).references(() => organization.id, { onDelete: 'cascade' }),
		name: varchar('name', { length: 100 }).notNull(),
		prefix: varchar('prefix', { length: 16 }).notNull(),
		tokenHash: varchar('token_hash', { length: 64 }).notNull().unique(),
		createdAt: createdAt(),
		lastUsedAt: datetime('last_used_at', { fsp: 3 }),
		expiresAt: datetime('expires_at', { fsp: 3 }),
		revokedAt: datetime('revoked_at', { fsp: 3 })
	},
	(t) => [index('api_token_user_idx').on(t.userId), index('api_token_workspace_idx').on(t.workspaceId)]
);

/**
 * Fixed-window request counters of the abuse limits (sign-in failures, sign-ups, reset links,
 * invitations), kept here rather than in one process's memory so every app instance behind one
 * address counts together. `bucket` is the limit's name plus a SHA-256 of what it counts by
 * (client address, e-mail, workspace), so no address or e-mail is stored in the clear.
 */
export const rateLimitBucket = mysqlTable(
	'rate_limit_bucket',
	{
		bucket: varchar('bucket', { length: 100 }).primaryKey(),
		hits: int('hits').notNull(),
		resetsAt: datetime('resets_at', { fsp: 3 }).notNull()
	},
	(t) => [index('rate_limit_bucket_resets_idx').on(t.resetsAt)]
);

export const projectRelations = relations(project, ({ many }) => ({ rails: many(rail) }));
export const railRelations = relations(rail, ({ one, many }) => ({
	project: one(project, { fields: [rail.projectId], references: [project.id] }),
	loops: many(loopRevision)
}));
export const loopRevisionRelations = relations(loopRevision, ({ one }) => ({
	rail: one(rail, { fields: [loopRevision.railId], references: [rail.id] }),
	author: one(user, { fields: [loopRevision.authorId], references: [user.id] })
}));
