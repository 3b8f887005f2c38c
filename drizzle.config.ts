import { defineConfig } from 'drizzle-kit';

const url =
	process.env.DATABASE_URL ??
	`mysql://${process.env.DB_USER ?? 'loopwright'}:${process.env.DB_PASSWORD ?? 'loopwright'}@${process.env.DB_HOST ?? '127.0.0.1'}:${process.env.DB_PORT ?? '3307'}/${process.env.DB_NAME ?? 'loopwright'}`;

export default defineConfig({
	dialect: 'mysql',
	schema: './src/lib/server/db/schema.ts',
	out: './drizzle',
	dbCredentials: { url },
	strict: true,
	verbose: true
});
