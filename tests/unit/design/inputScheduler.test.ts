// The design screen's input scheduling: visible work once per frame, deferred work once the
// input has been quiet, always in that order, and nothing left behind after dispose.
import { describe, expect, it } from 'vitest';
import { createInputScheduler } from '$lib/design/inputScheduler';
import { lastValueMemo } from '$lib/design/memo';

/** Manual frames and a manual clock, so the test decides when each fires. */
function harness(quietMs = 250) {
	const log: string[] = [];
	let frames = new Map<number, () => void>();
	let nextFrame = 1;
	let timers = new Map<number, { at: number; run: () => void }>();
	let nextTimer = 1;
	let now = 0;
	const s = createInputScheduler({
		onFrame: () => log.push('frame'),
		onSettled: () => log.push('settled'),
		quietMs,
		requestFrame: (run) => (frames.set(nextFrame, run), nextFrame++),
		cancelFrame: (id) => void frames.delete(id),
		setTimer: (run, ms) => (timers.set(nextTimer, { at: now + ms, run }), nextTimer++),
		clearTimer: (id) => void timers.delete(id as number)
	});
	return {
		s,
		log,
		frame() {
			const due = frames;
			frames = new Map();
			for (const run of due.values()) run();
		},
		advance(ms: number) {
			now += ms;
			for (const [id, t] of [...timers]) if (t.at <= now) (timers.delete(id), t.run());
		},
		pending: () => ({ frames: frames.size, timers: timers.size })
	};
}

describe('createInputScheduler', () => {
	it('coalesces the inputs of one frame into one visible run', () => {
		const h = harness();
		h.s.input();
		h.s.input();
		h.s.input();
		expect(h.pending().frames).toBe(1);
		h.frame();
		expect(h.log).toEqual(['frame']);
		h.s.input();
		h.frame();
		expect(h.log).toEqual(['frame', 'frame']);
	});

	it('runs the deferred work only after the input has been quiet for quietMs', () => {
		const h = harness(250);
		h.s.input();
		h.frame();
		h.advance(200);
		h.s.input(); // a second keystroke before the quiet time: the clock starts again
		h.frame();
		h.advance(200);
		expect(h.log).toEqual(['frame', 'frame']);
		h.advance(50);
		expect(h.log).toEqual(['frame', 'frame', 'settled']);
	});

	it('runs a frame that never came before the deferred work (a background tab gets no frames)', () => {
		const h = harness(250);
		h.s.input();
		h.advance(250);
		expect(h.log).toEqual(['frame', 'settled']);
		expect(h.s.framePending).toBe(false);
		h.frame(); // the late frame does nothing more
		expect(h.log).toEqual(['frame', 'settled']);
	});

	it('now() does both at once and leaves nothing pending', () => {
		const h = harness();
		h.s.input();
		h.s.now();
		expect(h.log).toEqual(['frame', 'settled']);
		expect(h.pending()).toEqual({ frames: 0, timers: 0 });
	});

	it('dispose() cancels what is pending', () => {
		const h = harness();
		h.s.input();
		h.s.dispose();
		h.frame();
		h.advance(1000);
		expect(h.log).toEqual([]);
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
