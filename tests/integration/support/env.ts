// Imported first by every integration test: points the server code at the test database
// before any module opens a pool. Never the development database, whatever the shell says.
process.env.DB_NAME = process.env.DB_NAME_TEST || 'loopwright_test';
process.env.LOOPWRIGHT_ENV = process.env.LOOPWRIGHT_ENV || 'test';
process.env.BETTER_AUTH_SECRET = process.env.BETTER_AUTH_SECRET || 'integration-test-secret-0123456789abcdef';
// A short session cookie cache (production default 60 s), so the session tests can wait it out.
process.env.SESSION_CACHE_SECONDS = '2';
// The suites create hundreds of users from 127.0.0.1; the sign-up cap is tested on its own instance.
process.env.SIGN_UP_LIMIT_PER_HOUR = '100000';
export {};
