/**
 * The drag preview: while a pole or zero of the network is dragged, only the network changes,
 * so each corner's Fm·Gvd is evaluated once (at drag start) and every frame rebuilds the
 * network from its corners with the engine (shape → parts → Gc, finite op-amp included),
 * evaluates Gc on the shared grid, adds it to the nine plants and reads the margins off the
 * samples. Dragging a zero keeps the gain above it unchanged (R2 held, C1 moves); dragging a
 * pole leaves the gain below it unchanged. On release the full analysis takes over.
 */
import { compensatorTf } from '$lib/engine/compensators';
import { frequencyResponse } from '$lib/engine';
import { partsFromShape, shapeFromParts, shapeProblem, type NetworkParts, type NetworkShape } from '$lib/engine/synthesis/networks';
import type { DesignAnalysis } from './analysis';
import { plantLoopResponse } from './analysis';
import { gridMargins, type GridMargins } from './gridMargins';
import { shapeRoots, type LoopOverride, type ShapeKey } from './plotData';

export interface DragSession {
	analysis: DesignAnalysis;
	shape: NetworkShape;
	parts: NetworkParts;
	opamp: { a0Db: number; gbw: number } | null;
	plants: ({ magDb: Float64Array; phaseDeg: Float64Array } | null)[];
}

/** The network that is built now (rounded parts where a series is set), as parts and corners. */
export function builtNetwork(a: DesignAnalysis): { parts: NetworkParts; shape: NetworkShape } {
	const c = a.nominal.response.compensator;
	const record = (c.rounded ?? c.ideal).parts;
	const parts = { kind: c.kind, ...record, rb: record.rb ?? null } as unknown as NetworkParts;
	return { parts, shape: shapeFromParts(parts) };
}

export function startDrag(a: DesignAnalysis): DragSession {
	const { parts, shape } = builtNetwork(a);
	return {
		analysis: a,
		shape,
		parts,
		opamp: a.nominal.document.compensator.opamp ?? null,
		plants: a.corners.map((c) => plantLoopResponse(a, c))
	};
}

/** The shape with the marker's corner(s) moved to freqHz. */
export function moveCorner(shape: NetworkShape, rootId: string, freqHz: number): NetworkShape {
	const next = { ...shape } as NetworkShape & Record<ShapeKey, number>;
	for (const key of rootId.split('+') as ShapeKey[]) {
		const old = next[key];
		if (!(old > 0)) continue;
		next[key] = freqHz;
		if (key.startsWith('zero')) next.integratorHz *= freqHz / old;
	}
	return next;
}

export interface PreviewFrame {
	shape: NetworkShape;
	override: LoopOverride;
	/** Per corner, in the analysis' corner order (null where the corner has no plant). */
	margins: (GridMargins | null)[];
}

/** One frame of the preview, or the reason the moved network cannot be built. */
export function previewFrame(s: DragSession, shape: NetworkShape): PreviewFrame | { problem: string } {
	const problem = shapeProblem(shape);
	if (problem) return { problem };
	const p = s.parts as NetworkParts & { gm?: number; ro?: number | null };
	const parts = partsFromShape(shape, { r1: p.r1, rb: p.rb, gm: p.gm, ro: p.ro });
	const gc = frequencyResponse(compensatorTf(parts, s.opamp), s.analysis.freqHz);
	const n = gc.magDb.length;
	const loops: LoopOverride['loops'] = [];
	const margins: (GridMargins | null)[] = [];
	for (const plant of s.plants) {
		const magDb = new Float64Array(n);
		const phaseDeg = new Float64Array(n);
		if (plant) {
			for (let i = 0; i < n; i++) {
				magDb[i] = plant.magDb[i] + gc.magDb[i];
				phaseDeg[i] = plant.phaseDeg[i] + gc.phaseDeg[i];
			}
		}
		loops.push({ magDb, phaseDeg });
		margins.push(plant ? gridMargins(s.analysis.freqHz, magDb, phaseDeg) : null);
	}
	const nominalIndex = s.analysis.corners.findIndex((c) => c.corner.nominal);
	const m = margins[nominalIndex];
	return {
		shape,
		margins,
		override: {
			loops,
			compensator: { magDb: gc.magDb, phaseDeg: gc.phaseDeg },
			crossover: m && m.crossoverHz !== null && m.phaseMarginDeg !== null ? { freqHz: m.crossoverHz, phaseMarginDeg: m.phaseMarginDeg } : null,
			gainMargin: m && m.gainMarginDb !== null && m.phaseCrossoverHz !== null ? { freqHz: m.phaseCrossoverHz, gainMarginDb: m.gainMarginDb } : null,
			roots: shapeRoots(shape, true)
		}
	};
}

/** The manual placement that reproduces a shape in the engine: sorted corners and the mid-band gain fI/fz(lowest). */
export function manualPlacement(shape: NetworkShape): { zerosHz: number[]; polesHz: number[]; midbandGainDb: number | null } {
	const s = shape as NetworkShape & Record<ShapeKey, number>;
	const zerosHz = (shape.kind === 'type3' ? [s.zero1Hz, s.zero2Hz] : shape.kind === 'type1' ? [] : [s.zeroHz]).sort((a, b) => a - b);
	const polesHz = (shape.kind === 'type3' ? [s.pole1Hz, s.pole2Hz] : shape.kind === 'type1' ? [] : [s.poleHz]).sort((a, b) => a - b);
	return { zerosHz, polesHz, midbandGainDb: zerosHz.length ? 20 * Math.log10(shape.integratorHz / zerosHz[0]) : null };
}
