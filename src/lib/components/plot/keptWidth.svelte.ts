/**
 * A plot's width, bound to its box's clientWidth, that keeps its last non-zero value while the
 * plot is hidden behind another tab (a hidden box measures 0 wide): the paths are neither redrawn
 * narrow while hidden nor drawn again when the tab shows.
 */
export class KeptWidth {
	/** Bind this: `bind:clientWidth={width.measured}`. */
	measured = $state(0);
	#last: number;
	constructor(initial: number) {
		this.measured = initial;
		this.#last = initial;
	}
	get value(): number {
		if (this.measured > 0) this.#last = this.measured;
		return this.#last;
	}
}
