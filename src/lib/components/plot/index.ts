/** The Bode plot and its data types; the plot only draws what it is given. */
export { default as BodePlot } from './BodePlot.svelte';
export type { BodeData, BodeTrace, PlotRoot, TraceKind, TraceVisibility, ReadoutRow } from './types';
export { TRACE_STYLE } from './style';
