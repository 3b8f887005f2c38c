// Connection and service settings, read from the environment with the same defaults as
// scripts/env.sh (documented in .env.example). Plain process.env so the set-up scripts that
// run outside SvelteKit (migrate, seed, mail fake) read exactly what the server reads.

function setting(name: string, fallback: string): string {
	const value = process.env[name];
	return value === undefined || value === '' ? fallback : value;
}

export function databaseUrl(database = setting('DB_NAME', 'loopwright')): string {
	if (process.env.DATABASE_URL) return process.env.DATABASE_URL;
	const user = encodeURIComponent(setting('DB_USER', 'loopwright'));
	const password = encodeURIComponent(setting('DB_PASSWORD', 'loopwright'));
	const host = setting('DB_HOST', '127.0.0.1');
	const port = setting('DB_PORT', '3307');
	return `mysql://${user}:${password}@${host}:${port}/${database}`;
}

export const smtpSettings = () => ({
	host: setting('SMTP_HOST', '127.0.0.1'),
	port: Number(setting('SMTP_PORT', '2525')),
	from: setting('MAIL_FROM', 'Loopwright <loopwright@localhost>')
});

export const isProduction = () => process.env.NODE_ENV === 'production' && process.env.LOOPWRIGHT_ENV !== 'development';
