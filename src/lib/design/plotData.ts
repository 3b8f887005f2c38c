/**
 * Analysis → the data the Bode plot draws: loop and plant traces at every corner (the nominal
 * bold), the network's response once (it does not change between corners), the nominal's
 * crossover and gain-margin marks, fsw/2, and the network's corners as draggable markers.
 */
import type { BodeData, BodeTrace, PlotRoot } from '$lib/components/plot';
import type { FreqMarker } from '$lib/components/plot/types';
import type { NetworkShape } from '$lib/engine/synthesis/networks';
import type { DesignAnalysis } from './analysis';

/** Marker ids ↔ the shape's corner keys. A double corner (z1 = z2) is one marker with both keys. */
export type ShapeKey = 'zeroHz' | 'poleHz' | 'zero1Hz' | 'zero2Hz' | 'pole1Hz' | 'pole2Hz';

export function shapeRoots(shape: NetworkShape, draggable: boolean): PlotRoot[] {
	const entries: { key: ShapeKey; type: 'zero' | 'pole'; label: string }[] =
		shape.kind === 'type3'
			? [
					{ key: 'zero1Hz', type: 'zero', label: 'fz1' },
					{ key: 'zero2Hz', type: 'zero', label: 'fz2' },
					{ key: 'pole1Hz', type: 'pole', label: 'fp1' },
					{ key: 'pole2Hz', type: 'pole', label: 'fp2' }
				]
			: shape.kind === 'type1'
				? []
				: [
						{ key: 'zeroHz', type: 'zero', label: 'fz' },
						{ key: 'poleHz', type: 'pole', label: 'fp' }
					];
	const freq = (k: ShapeKey) => (shape as unknown as Record<ShapeKey, number>)[k];
	const out: PlotRoot[] = [];
	for (const e of entries) {
		const twin = out.find((r) => r.type === e.type && Math.abs(Math.log(r.freqHz / freq(e.key))) < 0.005);
		if (twin) {
			twin.id += `+${e.key}`;
			twin.multiplicity += 1;
			twin.label = e.type === 'zero' ? 'fz1,2' : 'fp1,2';
			continue;
		}
		out.push({ id: e.key, type: e.type, freqHz: freq(e.key), multiplicity: 1, draggable, label: e.label });
	}
	return out;
}

export interface LoopOverride {
	/** Replaces the loop traces (drag preview): one per corner, in `a.corners` order. */
	loops: { magDb: ArrayLike<number>; phaseDeg: ArrayLike<number> }[];
	compensator: { magDb: ArrayLike<number>; phaseDeg: ArrayLike<number> };
	crossover: BodeData['crossover'];
	gainMargin: BodeData['gainMargin'];
	roots: PlotRoot[];
}

/** The critical frequencies of the nominal plant and the document's crossover target, for the plot's marks. */
export function criticalFrequencies(
	features: { f0Hz: number; esrZeroHz: readonly number[]; rhpZeroHz: number | null },
	fswHz: number,
	crossoverTargetHz: number | null | undefined
): FreqMarker[] {
	const out: FreqMarker[] = [];
	if (features.f0Hz > 0) out.push({ id: 'f0', label: 'LC f0', freqHz: features.f0Hz });
	// Several banks with the same ESR zero are one mark.
	for (const z of new Set(features.esrZeroHz.map((z) => Number(z.toPrecision(3))))) if (z > 0) out.push({ id: 'esr', label: 'ESR zero', freqHz: z });
	if (features.rhpZeroHz !== null && features.rhpZeroHz > 0) out.push({ id: 'rhp', label: 'RHP zero', freqHz: features.rhpZeroHz });
	out.push({ id: 'half-fsw', label: 'fsw/2', freqHz: fswHz / 2 });
	if (crossoverTargetHz) out.push({ id: 'fc-target', label: 'fc target', freqHz: crossoverTargetHz });
	return out.sort((x, y) => x.freqHz - y.freqHz);
}

export function bodeData(a: DesignAnalysis, roots: PlotRoot[], override?: LoopOverride): BodeData {
	const traces: BodeTrace[] = [];
	a.corners.forEach((c, i) => {
		if (!c.detail) return;
		const r = c.detail.response.response;
		const loop = override?.loops[i] ?? r.loop;
		traces.push({ id: `loop:${c.corner.id}`, kind: 'loop', label: c.corner.label, nominal: c.corner.nominal, magDb: loop.magDb, phaseDeg: loop.phaseDeg });
		traces.push({ id: `plant:${c.corner.id}`, kind: 'plant', label: c.corner.label, nominal: c.corner.nominal, magDb: r.plant.magDb, phaseDeg: r.plant.phaseDeg });
	});
	const gc = override?.compensator ?? a.nominal.response.response.compensator;
	traces.push({ id: 'compensator', kind: 'compensator', label: 'Network', nominal: true, magDb: gc.magDb, phaseDeg: gc.phaseDeg });

	const m = a.nominal.response.metrics;
	return {
		freqHz: a.freqHz,
		traces,
		crossover: override ? override.crossover : m.crossoverHz !== null && m.phaseMarginDeg !== null ? { freqHz: m.crossoverHz, phaseMarginDeg: m.phaseMarginDeg } : null,
		gainMargin: override ? override.gainMargin : m.gainMarginDb !== null && m.phaseCrossoverHz !== null ? { freqHz: m.phaseCrossoverHz, gainMarginDb: m.gainMarginDb } : null,
		modelLimitHz: a.document.plant.fsw / 2,
		control: a.document.modulator.control,
		markers: criticalFrequencies(a.nominal.response.features, a.document.plant.fsw, a.nominal.document.compensator.target?.crossoverHz),
		roots: override?.roots ?? roots
	};
}
