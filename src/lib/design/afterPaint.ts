/**
 * Runs work right after the browser has painted the next frame: an animation-frame callback
 * posts a task, and a task posted during a frame runs once that frame's style, layout and paint
 * are done. The design screen uses it for what an input changes beside the plot (parts, poles
 * and zeros, operating point, the verdict's "updating"), so the plot's repaint does not wait for
 * their layout. Latest wins: scheduling again before the earlier run replaces its work.
 *
 * Frame and task functions are injectable so the order can be tested without a browser.
 */
export interface AfterPaintOptions {
	requestFrame?: (run: () => void) => number;
	cancelFrame?: (id: number) => void;
	postTask?: (run: () => void) => void;
}

export interface AfterPaint {
	/** Runs `work` after the next painted frame, instead of any work scheduled before and not yet run. */
	schedule(work: () => void): void;
	/** Runs the waiting work now, if any (a release, a save: nothing may be left behind). */
	flush(): void;
	dispose(): void;
}

function messageTask(run: () => void) {
	const channel = new MessageChannel();
	channel.port1.onmessage = () => {
		channel.port1.close();
		run();
	};
	channel.port2.postMessage(null);
}

export function createAfterPaint(o: AfterPaintOptions = {}): AfterPaint {
	const requestFrame = o.requestFrame ?? ((run: () => void) => requestAnimationFrame(run));
	const cancelFrame = o.cancelFrame ?? ((id: number) => cancelAnimationFrame(id));
	const postTask = o.postTask ?? messageTask;
	let waiting: (() => void) | null = null;
	let frame: number | null = null;
	let posted = false;

	const run = () => {
		const work = waiting;
		waiting = null;
		work?.();
	};
	return {
		schedule(work) {
			waiting = work;
			if (frame !== null || posted) return;
			frame = requestFrame(() => {
				frame = null;
				posted = true;
				postTask(() => {
					posted = false;
					run();
				});
			});
		},
		flush() {
			if (frame !== null) cancelFrame(frame);
			frame = null;
			run();
		},
		dispose() {
			if (frame !== null) cancelFrame(frame);
			frame = null;
			waiting = null;
		}
	};
}
