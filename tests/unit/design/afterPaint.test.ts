// Work beside the plot (parts, poles and zeros, operating point) runs after the plot's frame is
// painted: an animation frame, then a task posted from it; the latest work wins, flush() runs it
// at once (a release, the settled input) and dispose() drops it. Common practice for a browser's
// rendering order: a task posted during a frame runs after that frame's style, layout and paint.
import { describe, expect, it } from 'vitest';
import { createAfterPaint } from '$lib/design/afterPaint';

function harness() {
	let frames = new Map<number, () => void>();
	let next = 1;
	let tasks: (() => void)[] = [];
	const p = createAfterPaint({
		requestFrame: (run) => (frames.set(next, run), next++),
		cancelFrame: (id) => void frames.delete(id),
		postTask: (run) => void tasks.push(run)
	});
	return {
		p,
		frame() {
			const due = frames;
			frames = new Map();
			for (const run of due.values()) run();
		},
		task() {
			const due = tasks;
			tasks = [];
			for (const run of due) run();
		},
		pending: () => ({ frames: frames.size, tasks: tasks.length })
	};
}

describe('createAfterPaint', () => {
	it('runs nothing in the frame itself, then the work in the task posted from it', () => {
		const h = harness();
		const log: string[] = [];
		h.p.schedule(() => log.push('a'));
		expect(h.pending()).toEqual({ frames: 1, tasks: 0 });
		h.frame();
		expect(log).toEqual([]);
		expect(h.pending()).toEqual({ frames: 0, tasks: 1 });
		h.task();
		expect(log).toEqual(['a']);
	});

	it('keeps only the latest work, with one frame and one task for all of it', () => {
		const h = harness();
		const log: string[] = [];
		h.p.schedule(() => log.push('a'));
		h.p.schedule(() => log.push('b'));
		expect(h.pending().frames).toBe(1);
		h.frame();
		h.p.schedule(() => log.push('c')); // after the frame, before its task: still that task
		expect(h.pending()).toEqual({ frames: 0, tasks: 1 });
		h.task();
		expect(log).toEqual(['c']);
		h.frame();
		h.task();
		expect(log).toEqual(['c']);
	});

	it('flush() runs the waiting work at once and leaves nothing to run later', () => {
		const h = harness();
		const log: string[] = [];
		h.p.schedule(() => log.push('a'));
		h.p.flush();
		expect(log).toEqual(['a']);
		expect(h.pending().frames).toBe(0);
		h.p.flush();
		expect(log).toEqual(['a']);
	});

	it('flush() between the frame and its task runs the work once', () => {
		const h = harness();
		const log: string[] = [];
		h.p.schedule(() => log.push('a'));
		h.frame();
		h.p.flush();
		h.task();
		expect(log).toEqual(['a']);
	});

	it('dispose() drops waiting work', () => {
		const h = harness();
		const log: string[] = [];
		h.p.schedule(() => log.push('a'));
		h.p.dispose();
		h.frame();
		h.task();
		expect(log).toEqual([]);
	});
});
