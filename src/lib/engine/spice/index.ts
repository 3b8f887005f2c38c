/** SPICE export: a netlist whose AC analysis reproduces the engine's loop gain (pure text generation). */
export { spiceNetlist, netlistFromAnalysis, SPICE_NODES, num as spiceNumber, type SpiceOptions } from './netlist';
