/**
 * An arrow key on a pole or zero marker: the frequency the marker moves to so that the value the
 * screen shows changes. A plain step is 1/50 decade, Shift or Page Up/Down 1/10 decade [chosen:
 * fine enough to tune, coarse enough to cross a decade in ten presses]; when the network is rounded
 * to E-series parts a single step can round back to the same part (E12 capacitors are 1/12 decade
 * apart), so the step is repeated until the built, rounded corner moves and reads differently.
 */
import { formatEng } from '$lib/units';
import { roundParts, type SeriesChoice } from '$lib/engine/synthesis/rounding';
import { partsFromShape, shapeFromParts, shapeProblem, type NetworkParts, type NetworkShape } from '$lib/engine/synthesis/networks';
import { moveCorner } from './preview';
import type { ShapeKey } from './plotData';

export const FINE_STEP_DECADES = 1 / 50;
export const COARSE_STEP_DECADES = 1 / 10;
/** Steps tried before giving up (a whole decade at the fine step). */
const MAX_STEPS = 50;

export interface KeyStepInput {
	/** The built network now (rounded parts where a series is set). */
	parts: NetworkParts;
	shape: NetworkShape;
	/** The document's series; null: parts are used as computed. */
	series: SeriesChoice | null;
	/** The plotted band: a marker never leaves it. */
	range: [number, number];
}

const cornerOf = (shape: NetworkShape, key: ShapeKey) => (shape as unknown as Record<ShapeKey, number>)[key];

/**
 * The ideal frequency to place the marker `rootId` at after one key press in `direction`, or null
 * when no step within a decade (or the band) changes the shown value or the network cannot be built.
 */
export function keyStepFreq(input: KeyStepInput, rootId: string, direction: 1 | -1, coarse: boolean): number | null {
	const key = rootId.split('+')[0] as ShapeKey;
	const now = cornerOf(input.shape, key);
	if (!(now > 0)) return null;
	const shown = formatEng(now, 'Hz');
	const step = coarse ? COARSE_STEP_DECADES : FINE_STEP_DECADES;
	const p = input.parts as NetworkParts & { gm?: number; ro?: number | null };
	for (let n = 1; n <= MAX_STEPS; n++) {
		const f = now * 10 ** (direction * n * step);
		if (f < input.range[0] || f > input.range[1]) return null;
		const moved = moveCorner(input.shape, rootId, f);
		if (shapeProblem(moved)) return null;
		const ideal = partsFromShape(moved, { r1: p.r1, rb: p.rb, gm: p.gm, ro: p.ro });
		const built = input.series ? roundParts(ideal, input.series) : ideal;
		const after = cornerOf(shapeFromParts(built), key);
		if (Math.sign(after - now) === direction && formatEng(after, 'Hz') !== shown) return f;
	}
	return null;
}
