// A plot's kept width: the guess until the box is first measured, then the last non-zero
// measurement (a box hidden behind another tab measures 0 and keeps its width); measuredOnce
// tells a browser-only plot when it may draw (common practice: draw once, at the real size).
import { describe, expect, it } from 'vitest';
import { KeptWidth } from '../../../src/lib/components/plot/keptWidth.svelte';

describe('KeptWidth', () => {
	it('is the guess and not yet measured before the box reports a width', () => {
		const w = new KeptWidth(900);
		expect(w.value).toBe(900);
		expect(w.measuredOnce).toBe(false);
	});

	it('takes the measured width, even one equal to the guess', () => {
		const w = new KeptWidth(900);
		w.measured = 900;
		expect(w.measuredOnce).toBe(true);
		expect(w.value).toBe(900);
		w.measured = 742;
		expect(w.value).toBe(742);
	});

	it('keeps the last width while the box is hidden (measures 0), still counted as measured', () => {
		const w = new KeptWidth(900);
		w.measured = 742;
		expect(w.value).toBe(742);
		w.measured = 0;
		expect(w.value).toBe(742);
		expect(w.measuredOnce).toBe(true);
	});
});

describe('KeptWidth.measuredOnce', () => {
	it('stays true once a width was seen, whether or not the width was read in between', () => {
		const w = new KeptWidth(900);
		w.measured = 600;
		expect(w.measuredOnce).toBe(true);
		w.measured = 0;
		expect(w.measuredOnce).toBe(true);
	});
});
