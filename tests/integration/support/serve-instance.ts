// One more app instance in a process of its own (Vite's dev server with SvelteKit, as startApp
// serves the main one) on PORT, for the tests that run several instances against one database.
// Run: node --import tsx tests/integration/support/serve-instance.ts   (PORT and the app's env set)
import { createServer } from 'vite';

const port = Number(process.env.PORT);
const server = await createServer({
	configFile: 'vite.config.ts',
	logLevel: 'error',
	server: { host: '127.0.0.1', port, strictPort: true, hmr: false, watch: null }
});
await server.listen();
const stop = async () => {
	await server.close();
	process.exit(0);
};
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
