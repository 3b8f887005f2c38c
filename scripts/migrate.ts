// Applies the committed migrations in drizzle/ to the database named by the environment.
// Runs drizzle-orm's migrator directly because drizzle-kit's own `migrate` exits 1 without
// printing the SQL error when a statement fails.
import { drizzle } from 'drizzle-orm/mysql2';
import { migrate } from 'drizzle-orm/mysql2/migrator';
import mysql from 'mysql2/promise';
import { databaseUrl } from '../src/lib/server/env';

const url = databaseUrl(process.argv[2] ?? process.env.DB_NAME ?? 'loopwright');
const connection = await mysql.createConnection({ uri: url, multipleStatements: true });
try {
	await migrate(drizzle(connection), { migrationsFolder: 'drizzle' });
	console.log(`[loopwright] migrations applied to ${new URL(url).pathname.slice(1)}`);
} catch (error) {
	const e = error as { message?: string; cause?: { sqlMessage?: string; sql?: string } };
	console.error('[loopwright] migration failed:', e.cause?.sqlMessage ?? e.message);
	if (e.cause?.sql) console.error('SQL:', e.cause.sql);
	process.exitCode = 1;
} finally {
	await connection.end();
}
