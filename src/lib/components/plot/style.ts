/**
 * How each trace kind looks. Colour follows the identity sheet (magnitude teal, phase orange,
 * compensator violet), and every kind also has its own dash so colour is never the only cue.
 * Class names are written out in full so Tailwind finds them.
 */
import type { TraceKind } from './types';

export interface TraceStyle {
	label: string;
	/** Stroke class in the magnitude panel and in the phase panel. */
	magClass: string;
	phaseClass: string;
	/** SVG stroke-dasharray; '' = solid. */
	dash: string;
}

export const TRACE_STYLE: Record<TraceKind, TraceStyle> = {
	loop: { label: 'Loop gain T', magClass: 'stroke-mag', phaseClass: 'stroke-phase', dash: '' },
	plant: { label: 'Plant Gvd', magClass: 'stroke-mag', phaseClass: 'stroke-phase', dash: '7 4' },
	compensator: { label: 'Network Gc', magClass: 'stroke-comp', phaseClass: 'stroke-comp', dash: '10 3 2 3' }
};

export const TRACE_ORDER: TraceKind[] = ['loop', 'plant', 'compensator'];

export const NOMINAL_WIDTH = 2;
export const CORNER_WIDTH = 1;
export const CORNER_OPACITY = 0.35;
