// The panel side of the one-answer workers (closed loop, sensitivity) and the workers' own loop,
// against stand-ins: a fake Worker for the panel, a fake `self` for the worker.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { latestAnswer } from '../../../src/lib/design/latestAnswer.svelte';
import { fakeWorkers } from './fakeWorker';

type To = { id: number; n: number };
type From = { id: number; type: 'value'; value: number } | { id: number; type: 'error'; message: string };

afterEach(() => {
	vi.unstubAllGlobals();
	vi.resetModules();
});

function harness(same?: (a: number[], b: number[]) => boolean) {
	vi.stubGlobal('Worker', class {});
	const { made, spawn } = fakeWorkers<To, From>();
	const log: string[] = [];
	const panel = latestAnswer<number[], To, From>({
		spawn,
		answer: (m) => log.push(m.type === 'value' ? `value ${m.value}` : `error ${m.message}`),
		failed: (message) => log.push(`failed ${message}`),
		same
	});
	return { made, log, panel };
}

describe('latestAnswer', () => {
	it('asks once per key, marks which key the answer is for, and drops the answer of a replaced request', () => {
		const elementwise = (a: number[], b: number[]) => a.every((k, i) => Object.is(k, b[i]));
		const { made, log, panel } = harness(elementwise);
		expect(panel.available).toBe(true);
		panel.ask([1, 2], (id) => ({ id, n: 12 }));
		panel.ask([1, 2], (id) => ({ id, n: 99 })); // the same key: not asked again
		expect(made[0].sent).toEqual([{ id: 1, n: 12 }]);
		expect(panel.answers([1, 2])).toBe(false);
		// A new key while the first is running: that worker is ended, a fresh one asked.
		panel.ask([3, 4], (id) => ({ id, n: 34 }));
		expect(made[0].terminated).toBe(true);
		expect(made[1].sent).toEqual([{ id: 2, n: 34 }]);
		made[1].answer({ id: 1, type: 'value', value: 12 });
		expect(log).toEqual([]);
		made[1].answer({ id: 2, type: 'value', value: 34 });
		expect(log).toEqual(['value 34']);
		expect(panel.answers([3, 4])).toBe(true);
		expect(panel.answers([1, 2])).toBe(false);
	});

	it('a worker that dies answers the key it was asked for with the failure', () => {
		const { made, log, panel } = harness();
		const key = [5];
		panel.ask(key, (id) => ({ id, n: 5 }));
		made[0].die('out of memory');
		expect(log).toEqual(['failed out of memory']);
		expect(panel.answers(key)).toBe(true);
		expect(panel.answers([5])).toBe(false); // default: the same value, not equal contents
	});

	it('without Worker (the server render) it is unavailable and asks nothing', () => {
		vi.stubGlobal('Worker', undefined);
		const { made, spawn } = fakeWorkers<To, From>();
		const panel = latestAnswer<number, To, From>({ spawn, answer: () => {}, failed: () => {} });
		expect(panel.available).toBe(false);
		panel.ask(1, (id) => ({ id, n: 1 }));
		expect(made).toHaveLength(0);
		expect(panel.answers(1)).toBe(false);
	});
});

describe('answerEachRequest (the workers’ loop)', () => {
	async function workerSelf() {
		const posted: unknown[] = [];
		const fake: { onmessage: ((e: MessageEvent) => void) | null; postMessage(m: unknown): void } = { onmessage: null, postMessage: (m) => posted.push(m) };
		vi.stubGlobal('self', fake);
		const { answerEachRequest, validDocument } = await import('../../../src/lib/design/workerReplies');
		return { posted, send: (data: unknown) => fake.onmessage!({ data } as MessageEvent), answerEachRequest, validDocument };
	}

	it('answers each request once with its id: the result, the error it returns, or an exception as an error', async () => {
		const { posted, send, answerEachRequest } = await workerSelf();
		answerEachRequest<To, From>(({ n }) => {
			if (n < 0) throw new Error('negative');
			return n === 0 ? { type: 'error', message: 'zero' } : { type: 'value', value: 2 * n };
		});
		send({ id: 7, n: 3 });
		send({ id: 8, n: 0 });
		send({ id: 9, n: -1 });
		expect(posted).toEqual([
			{ id: 7, type: 'value', value: 6 },
			{ id: 8, type: 'error', message: 'zero' },
			{ id: 9, type: 'error', message: 'negative' }
		]);
	});

	it('validDocument names the field and its rule', async () => {
		const { validDocument } = await workerSelf();
		const r = validDocument({ schemaVersion: 1 });
		expect('message' in r && r.message).toMatch(/plant/);
	});
});
