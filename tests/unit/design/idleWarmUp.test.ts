// The idle warm-up runs the open design's analysis a fixed number of times, only in idle periods:
// as many runs as an idle period has room for (at least one, so a page that is never idle still
// finishes through the callback's timeout), none after dispose() or after a run throws.
import { describe, expect, it } from 'vitest';
import { startIdleWarmUp, type IdleDeadlineLike } from '$lib/design/idleWarmUp';

function harness(runs: number, costMs = 5) {
	let idle: ((d: IdleDeadlineLike) => void)[] = [];
	let calls = 0;
	let clock = 0;
	const w = startIdleWarmUp({
		runs,
		reserveMs: 8,
		run: () => {
			calls++;
			clock += costMs;
		},
		requestIdle: (cb) => (idle.push(cb), idle.length),
		cancelIdle: () => void (idle = [])
	});
	return {
		w,
		calls: () => calls,
		/** One idle period of `ms`. */
		idle(ms: number) {
			const due = idle;
			idle = [];
			const end = clock + ms;
			for (const cb of due) cb({ timeRemaining: () => Math.max(0, end - clock) });
		},
		waiting: () => idle.length
	};
}

describe('startIdleWarmUp', () => {
	it('runs nothing until the browser is idle', () => {
		const h = harness(10);
		expect(h.calls()).toBe(0);
		expect(h.waiting()).toBe(1);
	});

	it('fills an idle period while room is left for another run, then asks for the next period', () => {
		const h = harness(10, 5);
		h.idle(30); // runs at 0, 5, 10, 15 (then 10 ms left is > 8: one more at 20; 5 left stops)
		expect(h.calls()).toBe(5);
		expect(h.waiting()).toBe(1);
		h.idle(50);
		expect(h.calls()).toBe(10);
		expect(h.w.done).toBe(10);
		expect(h.waiting()).toBe(0);
	});

	it('runs one per period when the periods are short (a busy page still gets there)', () => {
		const h = harness(3, 5);
		h.idle(1);
		h.idle(1);
		expect(h.calls()).toBe(2);
		h.idle(1);
		expect(h.calls()).toBe(3);
		expect(h.waiting()).toBe(0);
	});

	it('stops at dispose()', () => {
		const h = harness(10, 5);
		h.idle(12);
		const before = h.calls();
		h.w.dispose();
		h.idle(100);
		expect(h.calls()).toBe(before);
		expect(h.waiting()).toBe(0);
	});

	it('stops when a run throws (a design that cannot be analysed)', () => {
		let calls = 0;
		const idle: ((d: IdleDeadlineLike) => void)[] = [];
		startIdleWarmUp({
			runs: 5,
			run: () => {
				calls++;
				throw new Error('duty above its limit');
			},
			requestIdle: (cb) => idle.push(cb)
		});
		idle.shift()!({ timeRemaining: () => 100 });
		expect(calls).toBe(1);
		expect(idle.length).toBe(0);
	});
});
