// The one MariaDB pool and Drizzle handle of the server process. `mode: 'planetscale'` because
// MariaDB has no LATERAL join, which Drizzle's default relational queries need.
import { drizzle } from 'drizzle-orm/mysql2';
import mysql from 'mysql2/promise';
import * as schema from './schema';
import { databaseUrl } from '../env';

export function createDatabase(url = databaseUrl()) {
	const pool = mysql.createPool({
		uri: url,
		connectionLimit: 20,
		// Fail fast when the database is down instead of queueing requests for minutes.
		connectTimeout: 3000,
		enableKeepAlive: true,
		dateStrings: false,
		timezone: 'Z'
	});
	const db = drizzle(pool, { schema, mode: 'planetscale' });
	return { pool, db };
}

export type Database = ReturnType<typeof createDatabase>['db'];

const { pool, db } = createDatabase();
export { pool, db };

// adapter-node emits this on SIGTERM/SIGINT after the HTTP server closed; without ending the
// pool the process would stay alive.
process.on('sveltekit:shutdown', () => {
	void pool.end();
});
