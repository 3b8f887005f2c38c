import { defineConfig } from '@playwright/test';

// Browser tests drive Debian's Chromium (never a downloaded browser) against the production
// build served on its own port, with the test database and the test mail fake.
const port = Number(process.env.E2E_PORT ?? 4173);
const origin = `http://127.0.0.1:${port}`;

export default defineConfig({
	testDir: 'tests/e2e',
	workers: 1,
	retries: 0,
	timeout: 60_000,
	reporter: [['list'], ['json', { outputFile: process.env.PW_JSON_OUTPUT ?? 'test-results/e2e.json' }]],
	use: {
		baseURL: origin,
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync'
			]
		}
	},
	webServer: {
		command: 'node build',
		url: `${origin}/api/health`,
		reuseExistingServer: false,
		timeout: 60_000,
		env: {
			...(process.env as Record<string, string>),
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: origin,
			BETTER_AUTH_URL: origin,
			// adapter-node's default 512 kB would refuse bench files the API accepts (5 MB).
			BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT ?? '7M',
			// Every browser test signs up fresh users from 127.0.0.1 (the cap itself is an integration test).
			SIGN_UP_LIMIT_PER_HOUR: '100000'
		}
	}
});
