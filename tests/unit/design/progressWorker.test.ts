// The shared wiring of the spread and switching-check workers, against a stand-in Worker that
// records what it was sent and lets the test answer as the worker would.
import { describe, expect, it } from 'vitest';
import { progressWorker } from '../../../src/lib/design/progressWorker';
import { fakeWorkers } from './fakeWorker';

type To = { type: 'start'; runId: number; n: number } | { type: 'cancel'; runId: number };
type From = { type: 'progress'; runId: number; done: number; total: number } | { type: 'result'; runId: number; value: number } | { type: 'error'; runId: number; message: string };

function harness() {
	const { made, spawn } = fakeWorkers<To, From>();
	const log: string[] = [];
	const runner = progressWorker<To, From>(
		spawn,
		{ progress: (d, t) => log.push(`progress ${d}/${t}`), result: (m) => log.push(`result ${m.value}`), error: (m) => log.push(`error ${m}`) },
		'the worker stopped'
	);
	return { made, log, runner };
}

describe('progressWorker', () => {
	it('numbers each run, routes progress, result and error, and drops answers of an earlier run', () => {
		const { made, log, runner } = harness();
		runner.start((runId) => ({ type: 'start', runId, n: 10 }));
		runner.start((runId) => ({ type: 'start', runId, n: 20 }));
		expect(made).toHaveLength(1); // one worker serves every run until it is ended
		const w = made[0];
		expect(w.sent).toEqual([
			{ type: 'start', runId: 1, n: 10 },
			{ type: 'start', runId: 2, n: 20 }
		]);
		w.answer({ type: 'progress', runId: 1, done: 5, total: 10 });
		w.answer({ type: 'result', runId: 1, value: 1 });
		w.answer({ type: 'progress', runId: 2, done: 3, total: 20 });
		w.answer({ type: 'result', runId: 2, value: 2 });
		w.answer({ type: 'error', runId: 2, message: 'bad spec' });
		expect(log).toEqual(['progress 3/20', 'result 2', 'error bad spec']);
	});

	it('cancels by message to the current run, and a dead worker reports its own message or the fallback', () => {
		const { made, log, runner } = harness();
		runner.send((runId) => ({ type: 'cancel', runId })); // no worker yet: nothing to send to
		runner.start((runId) => ({ type: 'start', runId, n: 10 }));
		runner.send((runId) => ({ type: 'cancel', runId }));
		expect(made[0].sent.at(-1)).toEqual({ type: 'cancel', runId: 1 });
		made[0].die('');
		made[0].die('out of memory');
		expect(log).toEqual(['error the worker stopped', 'error out of memory']);
	});

	it('cancels by ending the worker: its late answers are dropped and the next run gets a new worker', () => {
		const { made, log, runner } = harness();
		runner.start((runId) => ({ type: 'start', runId, n: 10 }));
		const first = made[0];
		runner.end();
		expect(first.terminated).toBe(true);
		first.answer({ type: 'result', runId: 1, value: 1 });
		runner.start((runId) => ({ type: 'start', runId, n: 10 }));
		expect(made).toHaveLength(2);
		expect(made[1].sent).toEqual([{ type: 'start', runId: 2, n: 10 }]);
		made[1].answer({ type: 'result', runId: 2, value: 7 });
		expect(log).toEqual(['result 7']);
	});
});
