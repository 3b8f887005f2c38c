// Development only (Vite's dev server, the integration tests): the worker thread loads the
// TypeScript entry through tsx's loader, registered inside the thread (Node 20 does not pass
// `--import tsx` on to worker threads). The production build runs the bundled worker.js instead.
import { register } from 'tsx/esm/api';

register();
const entry = await import(new URL('./worker.ts', import.meta.url).href);
export default entry.default;
