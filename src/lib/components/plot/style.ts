/**
 * How each trace kind looks. Colour follows the identity sheet (magnitude teal, phase orange,
 * compensator violet), and every kind also has its own dash so colour is never the only cue.
 * Class names are written out in full so Tailwind finds them.
 */
import type { TraceKind } from './types';
import { plantTraceLabel, type ControlMode } from '$lib/text/controlMode';

export interface TraceStyle {
	label: string;
	/** Stroke class in the magnitude panel and in the phase panel. */
	magClass: string;
	phaseClass: string;
	/** SVG stroke-dasharray; '' = solid. */
	dash: string;
	/** The palette's custom property of the same colours, for the canvas (src/app.css). */
	magColour: string;
	phaseColour: string;
}

export const TRACE_STYLE: Record<TraceKind, TraceStyle> = {
	loop: { label: 'Loop gain T', magClass: 'stroke-mag', phaseClass: 'stroke-phase', dash: '', magColour: '--lw-mag', phaseColour: '--lw-phase' },
	plant: { label: plantTraceLabel('voltage'), magClass: 'stroke-mag', phaseClass: 'stroke-phase', dash: '7 4', magColour: '--lw-mag', phaseColour: '--lw-phase' },
	compensator: { label: 'Network Gc', magClass: 'stroke-comp', phaseClass: 'stroke-comp', dash: '10 3 2 3', magColour: '--lw-comp', phaseColour: '--lw-comp' }
};

/** A kind's name for people; the plant's follows the control method (`long`: with its input and output in words). */
export const traceLabel = (kind: TraceKind, control: ControlMode | undefined, long = false): string =>
	kind === 'plant' ? plantTraceLabel(control, long) : TRACE_STYLE[kind].label;

export const TRACE_ORDER: TraceKind[] = ['loop', 'plant', 'compensator'];

export const NOMINAL_WIDTH = 2;
export const CORNER_WIDTH = 1;
export const CORNER_OPACITY = 0.35;
