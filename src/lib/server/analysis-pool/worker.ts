// Entry of an analysis worker thread (tinypool imports it and calls the default export per
// task). It lowers its own thread's scheduling priority, so under CPU contention the request
// thread (health, pages, every other API call) runs first and analyses take the leftover time;
// it tells the pool when a task really starts, so the time budget counts work, not queueing.
import { setPriority } from 'node:os';
import { isMainThread, type MessagePort } from 'node:worker_threads';
import { runTask, type TaskRequest } from './tasks';

/** Where this module is, for the pool (the pool imports it only to read this). */
export const workerUrl: string = import.meta.url;

/** Nice value of the worker threads (Linux applies setpriority(pid 0) to the calling thread only). */
const WORKER_NICE = 10;

if (!isMainThread) {
	try {
		setPriority(WORKER_NICE);
	} catch {
		// Not permitted on this system: the analyses then share the CPU evenly with requests.
	}
}

export default function analysisWorker(message: { request: TaskRequest; started: MessagePort }) {
	message.started.postMessage('started');
	message.started.close();
	return runTask(message.request);
}
