// The design screen's input scheduling: the first input's visible work at once (in the input's own
// task), later inputs within a frame interval coalesced into the next frame, deferred work once the
// input has been quiet, always in that order, and nothing left behind after now() or dispose().
import { describe, expect, it } from 'vitest';
import { createInputScheduler } from '$lib/design/inputScheduler';
import { lastValueMemo } from '$lib/design/memo';

/** Manual frames, microtasks and clock, so the test decides when each fires. */
function harness(quietMs = 250, frameMs = 16) {
	const log: string[] = [];
	let frames = new Map<number, () => void>();
	let nextFrame = 1;
	let soon: (() => void)[] = [];
	let timers = new Map<number, { at: number; run: () => void }>();
	let nextTimer = 1;
	let now = 0;
	const s = createInputScheduler({
		onFrame: () => log.push('frame'),
		onSettled: () => log.push('settled'),
		quietMs,
		frameMs,
		now: () => now,
		runSoon: (run) => void soon.push(run),
		requestFrame: (run) => (frames.set(nextFrame, run), nextFrame++),
		cancelFrame: (id) => void frames.delete(id),
		setTimer: (run, ms) => (timers.set(nextTimer, { at: now + ms, run }), nextTimer++),
		clearTimer: (id) => void timers.delete(id as number)
	});
	return {
		s,
		log,
		/** The end of the input's task: its queued microtasks run. */
		endTask() {
			const due = soon;
			soon = [];
			for (const run of due) run();
		},
		frame() {
			const due = frames;
			frames = new Map();
			for (const run of due.values()) run();
		},
		advance(ms: number) {
			now += ms;
			for (const [id, t] of [...timers]) if (t.at <= now) (timers.delete(id), t.run());
		},
		pending: () => ({ frames: frames.size, soon: soon.length, timers: timers.size })
	};
}

describe('createInputScheduler', () => {
	it('runs the first input at the end of its own task, not a frame later', () => {
		const h = harness();
		h.s.input();
		expect(h.log).toEqual([]); // not inside the handler itself
		expect(h.s.framePending).toBe(true);
		h.endTask();
		expect(h.log).toEqual(['frame']);
		expect(h.pending().frames).toBe(0);
		expect(h.s.framePending).toBe(false);
	});

	it('coalesces the inputs of one task into one visible run', () => {
		const h = harness();
		h.s.input();
		h.s.input();
		h.s.input();
		h.endTask();
		expect(h.log).toEqual(['frame']);
		expect(h.pending().frames).toBe(0);
	});

	it('puts inputs within a frame interval of the last run into one run in the next frame', () => {
		const h = harness(250, 16);
		h.s.input();
		h.endTask();
		h.advance(5);
		h.s.input();
		h.endTask();
		h.advance(3);
		h.s.input();
		h.endTask();
		expect(h.log).toEqual(['frame']); // nothing more before the frame
		expect(h.pending().frames).toBe(1);
		h.frame();
		expect(h.log).toEqual(['frame', 'frame']);
	});

	it('runs at once again once a frame interval has passed since the last run', () => {
		const h = harness(250, 16);
		h.s.input();
		h.endTask();
		h.advance(16);
		h.s.input();
		h.endTask();
		expect(h.log).toEqual(['frame', 'frame']);
		expect(h.pending().frames).toBe(0);
	});

	it('runs the deferred work only after the input has been quiet for quietMs', () => {
		const h = harness(250);
		h.s.input();
		h.endTask();
		h.advance(200);
		h.s.input(); // a second keystroke before the quiet time: the clock starts again
		h.endTask();
		h.advance(200);
		expect(h.log).toEqual(['frame', 'frame']);
		h.advance(50);
		expect(h.log).toEqual(['frame', 'frame', 'settled']);
	});

	it('runs a frame that never came before the deferred work (a background tab gets no frames)', () => {
		const h = harness(250, 16);
		h.s.input();
		h.endTask();
		h.advance(1);
		h.s.input(); // within the frame interval: waits for a frame
		h.advance(250);
		expect(h.log).toEqual(['frame', 'frame', 'settled']);
		expect(h.s.framePending).toBe(false);
		h.frame(); // the late frame does nothing more
		expect(h.log).toEqual(['frame', 'frame', 'settled']);
	});

	it('now() does both at once and leaves nothing pending, not even a queued run', () => {
		const h = harness();
		h.s.input();
		h.s.now();
		expect(h.log).toEqual(['frame', 'settled']);
		h.endTask(); // the run queued by the input is void
		expect(h.log).toEqual(['frame', 'settled']);
		expect(h.pending()).toEqual({ frames: 0, soon: 0, timers: 0 });
	});

	it('dispose() cancels what is pending', () => {
		const h = harness(250, 16);
		h.s.input();
		h.s.dispose();
		h.endTask();
		h.frame();
		h.advance(1000);
		expect(h.log).toEqual([]);
		const g = harness(250, 16);
		g.s.input();
		g.endTask();
		g.s.input(); // within the frame interval: a frame is requested
		g.s.dispose();
		g.frame();
		g.advance(1000);
		expect(g.log).toEqual(['frame']);
	});
});

describe('lastValueMemo', () => {
	it('reuses the last value while the keys are the same and recomputes when one changes', () => {
		const memo = lastValueMemo<[object, number], number>();
		const a = {};
		let runs = 0;
		const f = () => ++runs;
		expect(memo([a, 1], f)).toBe(1);
		expect(memo([a, 1], f)).toBe(1);
		expect(memo([{}, 1], f)).toBe(2); // another object with the same contents is another snapshot
		expect(memo([a, 2], f)).toBe(3);
		expect(memo([a, NaN], f)).toBe(4);
		expect(memo([a, NaN], f)).toBe(4); // Object.is: NaN is the same key
	});
});
