/**
 * When the design screen does its work after an input (a keystroke, a pasted value).
 *
 * The visible part (the analysis the plot, parts and margins show): when no visible work ran in
 * the last frame interval, at once, still inside the input's own task (a microtask after the
 * handler), so the browser's next frame paints it; waiting for the next animation frame instead
 * put the work, and with it the paint, up to a frame later. Inputs that arrive while a run is
 * pending, or within a frame interval of the last run, are coalesced into one run in the next
 * animation frame, so a fast typist or a held key never makes the screen do more than one
 * visible run per frame.
 *
 * The heavier part (the verdict with its tolerance corners, the closed-loop, step and
 * input-filter panels) only once the input has been quiet for `quietMs`, so it never runs
 * between two keystrokes of a word, and always after the visible work of the last input.
 *
 * Frame, microtask, timer and clock functions are injectable so the order of events can be
 * tested without a browser.
 */
export interface InputSchedulerOptions {
	/** Runs the visible work; called at most once per frame interval after inputs. */
	onFrame: () => void;
	/** Runs the deferred work, always after the frame work of the last input. */
	onSettled: () => void;
	/** Quiet time after the last input before onSettled, ms. */
	quietMs: number;
	/** The frame interval, ms [common practice: a 60 Hz display, 1000/60]. */
	frameMs?: number;
	now?: () => number;
	/** Runs `run` after the current handler and before the browser renders (a microtask). */
	runSoon?: (run: () => void) => void;
	requestFrame?: (run: () => void) => number;
	cancelFrame?: (id: number) => void;
	setTimer?: (run: () => void, ms: number) => unknown;
	clearTimer?: (id: unknown) => void;
}

export interface InputScheduler {
	/** An input happened: frame work now or in the next frame, deferred work after the quiet time. */
	input(): void;
	/** Both now (the first analysis, the release of a drag): nothing left pending. */
	now(): void;
	/** Whether visible work is waiting to run. */
	readonly framePending: boolean;
	dispose(): void;
}

/**
 * The quiet time the design screen waits before the verdict and the heavier panels, ms: longer
 * than the gap between two keystrokes of one value (about 200–350 ms at 35–60 words a minute
 * [common practice]), so their work, and the verdict's answer, land after the value is typed,
 * not between its keystrokes.
 */
export const SETTLE_MS = 450;

export function createInputScheduler(o: InputSchedulerOptions): InputScheduler {
	const frameMs = o.frameMs ?? 1000 / 60;
	const clock = o.now ?? (() => performance.now());
	const runSoon = o.runSoon ?? ((run: () => void) => queueMicrotask(run));
	const requestFrame = o.requestFrame ?? ((run: () => void) => requestAnimationFrame(run));
	const cancelFrame = o.cancelFrame ?? ((id: number) => cancelAnimationFrame(id));
	const setTimer = o.setTimer ?? ((run: () => void, ms: number) => setTimeout(run, ms));
	const clearTimer = o.clearTimer ?? ((id: unknown) => clearTimeout(id as ReturnType<typeof setTimeout>));
	let frame: number | null = null;
	/** A run queued with runSoon; a number so that one cancelled by now() or dispose() does nothing. */
	let soon: number | null = null;
	let soonSeq = 0;
	let timer: unknown = null;
	/** When the last visible run started (-Infinity: none yet). */
	let lastRunAt = -Infinity;

	const cancelPending = () => {
		if (frame !== null) cancelFrame(frame);
		frame = null;
		soon = null;
	};
	const runVisible = () => {
		cancelPending();
		lastRunAt = clock();
		o.onFrame();
	};
	const settle = () => {
		timer = null;
		// A frame that never came (a background tab gets no animation frames) runs first, so the
		// deferred work always sees the last input's analysis.
		if (frame !== null || soon !== null) runVisible();
		o.onSettled();
	};
	const stopTimer = () => {
		if (timer !== null) clearTimer(timer);
		timer = null;
	};

	return {
		input() {
			stopTimer();
			timer = setTimer(settle, o.quietMs);
			if (frame !== null || soon !== null) return; // coalesced into the run already waiting
			if (clock() - lastRunAt >= frameMs) {
				const mine = ++soonSeq;
				soon = mine;
				runSoon(() => {
					if (soon === mine) runVisible();
				});
			} else {
				frame = requestFrame(() => {
					frame = null;
					runVisible();
				});
			}
		},
		now() {
			stopTimer();
			runVisible();
			o.onSettled();
		},
		get framePending() {
			return frame !== null || soon !== null;
		},
		dispose() {
			stopTimer();
			cancelPending();
		}
	};
}
