/**
 * When the design screen does its work after an input (a keystroke, a pasted value): the
 * visible part (the analysis the plot, parts and margins show) once in the next animation frame,
 * however many inputs arrived before it, so it paints in that frame; the heavier part (the
 * verdict with its tolerance corners, the closed-loop, step and input-filter panels) only once
 * the input has been quiet for `quietMs`, so it never runs between two keystrokes of a word.
 * Frame and timer functions are injectable so the order of events can be tested without a browser.
 */
export interface InputSchedulerOptions {
	/** Runs the visible work; called at most once per frame. */
	onFrame: () => void;
	/** Runs the deferred work, always after the frame work of the last input. */
	onSettled: () => void;
	/** Quiet time after the last input before onSettled, ms. */
	quietMs: number;
	requestFrame?: (run: () => void) => number;
	cancelFrame?: (id: number) => void;
	setTimer?: (run: () => void, ms: number) => unknown;
	clearTimer?: (id: unknown) => void;
}

export interface InputScheduler {
	/** An input happened: frame work next frame, deferred work after the quiet time. */
	input(): void;
	/** Both now (the first analysis, the release of a drag): nothing left pending. */
	now(): void;
	/** Whether visible work is waiting for its frame. */
	readonly framePending: boolean;
	dispose(): void;
}

/** The quiet time the design screen waits before the verdict and the heavier panels, ms. */
export const SETTLE_MS = 250;

export function createInputScheduler(o: InputSchedulerOptions): InputScheduler {
	const requestFrame = o.requestFrame ?? ((run: () => void) => requestAnimationFrame(run));
	const cancelFrame = o.cancelFrame ?? ((id: number) => cancelAnimationFrame(id));
	const setTimer = o.setTimer ?? ((run: () => void, ms: number) => setTimeout(run, ms));
	const clearTimer = o.clearTimer ?? ((id: unknown) => clearTimeout(id as ReturnType<typeof setTimeout>));
	let frame: number | null = null;
	let timer: unknown = null;

	const runFrame = () => {
		if (frame !== null) cancelFrame(frame);
		frame = null;
		o.onFrame();
	};
	const settle = () => {
		timer = null;
		// A frame that never came (a background tab gets no animation frames) runs first, so the
		// deferred work always sees the last input's analysis.
		if (frame !== null) runFrame();
		o.onSettled();
	};
	const stopTimer = () => {
		if (timer !== null) clearTimer(timer);
		timer = null;
	};

	return {
		input() {
			if (frame === null) frame = requestFrame(() => ((frame = null), o.onFrame()));
			stopTimer();
			timer = setTimer(settle, o.quietMs);
		},
		now() {
			stopTimer();
			runFrame();
			o.onSettled();
		},
		get framePending() {
			return frame !== null;
		},
		dispose() {
			stopTimer();
			if (frame !== null) cancelFrame(frame);
			frame = null;
		}
	};
}
