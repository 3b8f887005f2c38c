// Runs once before the integration files: migrates the test database, makes sure a fake
// SMTP server listens, and serves the app (Vite dev server) for all files, which read its
// address with inject('appOrigin'). Warms the routes up so the first test is not the slow one.
import type { TestProject } from 'vitest/node';
import { startApp } from './app';
import { signUp } from './client';

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
	await warmAnalysisPool(app.origin);
	project.provide('appOrigin', app.origin);
	project.provide('mailDir', app.mailDir);
	project.provide('smtpPort', process.env.SMTP_PORT!);
	return () => app.stop();
}

/** One analysis as a signed-in (confirmed) user: waits until the analysis pool's workers have
 * loaded (in the dev server they compile the engine through tsx, seconds on a busy machine). */
async function warmAnalysisPool(origin: string) {
	const user = await signUp(origin, 'warm-up');
	const reply = await user.post('/api/v1/analyze', {});
	if (reply.status !== 400) throw new Error(`the analysis pool did not answer the warm-up: ${reply.status} ${JSON.stringify(reply.body)}`);
}
