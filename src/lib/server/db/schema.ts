// Application tables. Singular names and snake_case columns, matching better-auth's tables,
// which are generated into auth-schema.ts and re-exported here.
import { datetime, int, mysqlTable, varchar } from 'drizzle-orm/mysql-core';

/** Records that the demo seed ran, so `npm start` seeds once and never duplicates. */
export const seedMark = mysqlTable('seed_mark', {
	id: int('id').autoincrement().primaryKey(),
	name: varchar('name', { length: 64 }).notNull().unique(),
	appliedAt: datetime('applied_at', { fsp: 3 }).notNull()
});
