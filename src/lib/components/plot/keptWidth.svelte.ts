/**
 * A plot's width, bound to its box's clientWidth, that keeps its last non-zero value while the
 * plot is hidden behind another tab (a hidden box measures 0 wide): the paths are neither redrawn
 * narrow while hidden nor drawn again when the tab shows. Until the box is first measured the
 * width is the guess given; `measuredOnce` tells a plot that would rather wait than draw at the
 * guess and then again at the real width.
 */
export class KeptWidth {
	/** Bind this: `bind:clientWidth={width.measured}`. */
	measured = $state(0);
	#last: number;
	#seen = false;
	constructor(initial: number) {
		this.#last = initial;
	}
	get value(): number {
		if (this.measured > 0) {
			this.#last = this.measured;
			this.#seen = true;
		}
		return this.#last;
	}
	/** Whether the box has been measured at least once. */
	get measuredOnce(): boolean {
		if (this.measured > 0) this.#seen = true;
		return this.#seen;
	}
}
