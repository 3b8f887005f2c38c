/**
 * Runs a piece of work a number of times while the browser is idle, a few runs per idle period.
 *
 * Why: the JavaScript engine compiles a function to fast machine code only after it has run a
 * few dozen times. The design screen's analysis runs once when the screen opens, so the first
 * thirty or so keystrokes ran it in slower tiers (in Node: about 3–17 ms a run for the first
 * thirty runs, 1.6 ms after). Running the same analysis on the open design while nothing else
 * happens makes the person's first keystrokes as fast as the later ones. Idle callbacks give
 * way to input, so this never delays one.
 *
 * The idle scheduler is injectable so the order can be tested without a browser.
 */
export interface IdleDeadlineLike {
	timeRemaining(): number;
}

export interface IdleWarmUpOptions {
	/** One run of the work; its result is thrown away. */
	run: () => void;
	/** How many runs in all. */
	runs: number;
	/** Idle time a run needs, ms: a period with less left ends the slice. */
	reserveMs?: number;
	requestIdle?: (callback: (deadline: IdleDeadlineLike) => void) => number;
	cancelIdle?: (id: number) => void;
}

export interface IdleWarmUp {
	/** Runs done so far. */
	readonly done: number;
	dispose(): void;
}

/**
 * requestIdleCallback, or where a browser lacks it (Safari) a timer with a 50 ms period whose
 * remaining time runs down with the clock, as an idle period's does.
 */
function defaultRequestIdle(callback: (deadline: IdleDeadlineLike) => void): number {
	if (typeof requestIdleCallback === 'function') return requestIdleCallback(callback, { timeout: 2000 });
	return setTimeout(() => {
		const start = performance.now();
		callback({ timeRemaining: () => Math.max(0, 50 - (performance.now() - start)) });
	}, 50) as unknown as number;
}

export function startIdleWarmUp(o: IdleWarmUpOptions): IdleWarmUp {
	const reserveMs = o.reserveMs ?? 8;
	const requestIdle = o.requestIdle ?? defaultRequestIdle;
	const cancelIdle = o.cancelIdle ?? ((id: number) => (typeof cancelIdleCallback === 'function' ? cancelIdleCallback(id) : clearTimeout(id)));
	let done = 0;
	let pending: number | null = null;
	let stopped = false;

	const slice = (deadline: IdleDeadlineLike) => {
		pending = null;
		if (stopped) return;
		// At least one run per slice, so a busy page still finishes (the timeout above).
		do {
			try {
				o.run();
			} catch {
				// A design that cannot be analysed warms nothing; the screen shows its error.
				stopped = true;
				return;
			}
			done++;
		} while (done < o.runs && deadline.timeRemaining() > reserveMs);
		if (done < o.runs) pending = requestIdle(slice);
	};
	if (o.runs > 0) pending = requestIdle(slice);

	return {
		get done() {
			return done;
		},
		dispose() {
			stopped = true;
			if (pending !== null) cancelIdle(pending);
			pending = null;
		}
	};
}
