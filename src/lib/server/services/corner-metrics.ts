// Loop metrics at every corner of a rail (Vin min/nom/max × Iout min/max) with the engine.
// The network is fixed at the parts the nominal analysis built (rounded where a series is
// set), so corners vary the power stage only, as the built board would. With feed-forward the
// ramp follows Vin (design-document.md: `vramp` is the ramp at the nominal vin).
import { analyzeDesign } from '../../engine/analyze';
import type { DesignDocument } from '../../engine/contract/designSchema';
import type { AnalysisResponse } from '../../engine/contract/responseSchema';
import { railCorners, type RailOperatingRange } from '../../corners';
import type { CornerMetrics } from './types';

const PART_KEYS = ['r2', 'r3', 'c1', 'c2', 'c3', 'gm', 'ro'] as const;

function builtParts(response: AnalysisResponse): Record<string, number> {
	const parts = (response.compensator.rounded ?? response.compensator.ideal).parts;
	return Object.fromEntries(PART_KEYS.filter((k) => parts[k] !== undefined).map((k) => [k, parts[k]]));
}

function summarize(corner: CornerMetrics['corner'], result: ReturnType<typeof analyzeDesign>): CornerMetrics {
	if ('error' in result) {
		return { corner, crossoverHz: null, phaseMarginDeg: null, gainMarginDb: null, closedLoopStable: null, warnings: [], error: result.error.message };
	}
	const m = result.metrics;
	return {
		corner,
		crossoverHz: m.crossoverHz,
		phaseMarginDeg: m.phaseMarginDeg,
		gainMarginDb: m.gainMarginDb,
		closedLoopStable: m.closedLoopStable,
		warnings: result.warnings.map((w) => w.code)
	};
}

/**
 * Analyses `design` (already validated) at each corner of `rail`. The first entry is the
 * nominal corner. Corners the engine refuses (e.g. duty out of range) carry `error`.
 */
export function cornerMetrics(design: DesignDocument, rail: RailOperatingRange): CornerMetrics[] {
	const corners = railCorners(rail);
	const nominal = analyzeDesign({ ...design, plant: { ...design.plant, vin: rail.vinNom, iout: rail.ioutNom } }, { includeResponse: false });
	if ('error' in nominal) return corners.map((c) => summarize(c, nominal));
	const compensator = { ...design.compensator, parts: builtParts(nominal), series: null };
	return corners.map((corner) => {
		const vramp = design.modulator.feedForward ? (design.modulator.vramp * corner.vin) / rail.vinNom : design.modulator.vramp;
		const doc = {
			...design,
			plant: { ...design.plant, vin: corner.vin, iout: corner.iout },
			modulator: { ...design.modulator, vramp },
			compensator
		};
		return summarize(corner, analyzeDesign(doc, { includeResponse: false }));
	});
}

