// Runs once before the integration files: migrates the test database, makes sure a fake
// SMTP server listens, and serves the app (Vite dev server) for all files, which read its
// address with inject('appOrigin'). Warms the routes up so the first test is not the slow one.
import type { TestProject } from 'vitest/node';
import { startApp } from './app';

declare module 'vitest' {
	export interface ProvidedContext {
		appOrigin: string;
		mailDir: string;
		smtpPort: string;
	}
}

export default async function setup(project: TestProject) {
	const app = await startApp();
	await Promise.all(['/api/v1/me', '/api/health', '/sign-in'].map((path) => fetch(app.origin + path).then((r) => r.text())));
	await fetch(app.origin + '/api/v1/analyze', { method: 'POST', headers: { 'content-type': 'application/json', origin: app.origin }, body: '{}' });
	project.provide('appOrigin', app.origin);
	project.provide('mailDir', app.mailDir);
	project.provide('smtpPort', process.env.SMTP_PORT!);
	return () => app.stop();
}
