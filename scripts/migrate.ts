// Applies the committed migrations in drizzle/ to the database named by the environment, then
// the data step: stored revisions without a verdict (rows from before verdicts were stored) get
// their missing spec sections from their rail and a verdict from the engine; verdicts of an
// older engine version are re-verified (flagging rails whose verdict changed). Runs
// drizzle-orm's migrator directly because drizzle-kit's own `migrate` exits 1 without printing
// the SQL error when a statement fails.
import { drizzle } from 'drizzle-orm/mysql2';
import { migrate } from 'drizzle-orm/mysql2/migrator';
import mysql from 'mysql2/promise';
import { databaseUrl } from '../src/lib/server/env';

const url = databaseUrl(process.argv[2] ?? process.env.DB_NAME ?? 'loopwright');
const connection = await mysql.createConnection({ uri: url, multipleStatements: true });
try {
	await migrate(drizzle(connection), { migrationsFolder: 'drizzle' });
	console.log(`[loopwright] migrations applied to ${new URL(url).pathname.slice(1)}`);
	// Imported here so a schema migration never waits on the engine.
	const schema = await import('../src/lib/server/db/schema');
	const { reverify } = await import('../src/lib/server/services/verdicts');
	// One connection instead of the server's pool; the query surface is the same.
	const data = drizzle(connection, { schema, mode: 'planetscale' }) as unknown as import('../src/lib/server/db').Database;
	const entries = await reverify(data);
	if (entries.length) {
		const flagged = entries.filter((e) => e.flagged).length;
		const failed = entries.filter((e) => e.error).length;
		console.log(`[loopwright] verdicts stored for ${entries.length} revision(s)${flagged ? `, ${flagged} rail(s) flagged` : ''}${failed ? `, ${failed} could not be verified` : ''}`);
	}
} catch (error) {
	const e = error as { message?: string; cause?: { sqlMessage?: string; sql?: string } };
	console.error('[loopwright] migration failed:', e.cause?.sqlMessage ?? e.message);
	if (e.cause?.sql) console.error('SQL:', e.cause.sql);
	process.exitCode = 1;
} finally {
	await connection.end();
}
