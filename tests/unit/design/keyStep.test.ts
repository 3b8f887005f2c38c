// Arrow keys on a pole/zero marker move the value the screen shows (a 1/50-decade step
// was rounded away by the E-series parts, so plain arrows did nothing).
import { describe, expect, it } from 'vitest';
import { keyStepFreq, FINE_STEP_DECADES } from '$lib/design/keyStep';
import { moveCorner } from '$lib/design/preview';
import { roundParts } from '$lib/engine/synthesis/rounding';
import { partsFromShape, shapeFromParts, type NetworkParts } from '$lib/engine/synthesis/networks';
import { formatEng } from '$lib/units';

// A Type III already built from E96 resistors and E12 capacitors [published: IEC 60063 E12 values 2.2, 1.0].
const parts = { kind: 'type3', r1: 10_000, rb: 2_000, r2: 20_000, c1: 2.2e-9, c2: 100e-12, r3: 499, c3: 1e-9 } as NetworkParts;
const shape = shapeFromParts(parts);
const series = { resistors: 'E96', capacitors: 'E12' } as const;
const input = { parts, shape, series, range: [10, 1e7] as [number, number] };
const z1 = (s: ReturnType<typeof shapeFromParts>) => (s as { zero1Hz: number }).zero1Hz;

function shownAfter(f: number): string {
	const moved = moveCorner(shape, 'zero1Hz', f);
	return formatEng(z1(shapeFromParts(roundParts(partsFromShape(moved, { r1: parts.r1, rb: parts.rb }), series))), 'Hz');
}

describe('keyStepFreq', () => {
	it('the old fixed 1/50-decade step is rounded back to the same shown value (the defect)', () => {
		const old = z1(shape) * 10 ** FINE_STEP_DECADES;
		expect(shownAfter(old)).toBe(formatEng(z1(shape), 'Hz'));
	});
	it('up and down each move the shown, rounded corner in their direction', () => {
		for (const dir of [1, -1] as const) {
			const f = keyStepFreq(input, 'zero1Hz', dir, false);
			expect(f).not.toBeNull();
			expect(Math.sign(f! - z1(shape))).toBe(dir);
			expect(shownAfter(f!)).not.toBe(formatEng(z1(shape), 'Hz'));
			// no further than needed: at most 1/12 decade (one E12 step) plus one fine step beyond it
			expect(Math.abs(Math.log10(f! / z1(shape)))).toBeLessThanOrEqual(1 / 12 + FINE_STEP_DECADES + 1e-9);
		}
	});
	it('without rounding one fine step is enough; the band edge stops the marker', () => {
		const f = keyStepFreq({ ...input, series: null }, 'zero1Hz', 1, false)!;
		expect(Math.log10(f / z1(shape))).toBeCloseTo(FINE_STEP_DECADES, 12);
		expect(keyStepFreq({ ...input, range: [z1(shape) * 0.999, 1e7] }, 'zero1Hz', -1, false)).toBeNull();
	});
});
