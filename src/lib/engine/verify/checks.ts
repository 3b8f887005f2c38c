/**
 * The checks run at every corner beyond the plant's own warnings (DCM, near the CCM boundary):
 * the crossover against the RHP zero (compensators/crossoverLimit.ts), the op-amp's bandwidth against the noise gain (compensators/checks.ts, docs/formulas.md §5.6 rule) and, when the
 * document has an input filter, Middlebrook's criterion (inputfilter/, docs/formulas.md §9). One definition, used
 * by the verdict and by the analysis response's corners section.
 */
import type { CornerCheck } from '../corners/corners';
import type { DesignDocument } from '../contract/designSchema';
import { opampWarnings } from '../compensators/checks';
import { rhpZeroWarning } from '../compensators/crossoverLimit';
import { idealCompensatorTf } from '../compensators/transfer';
import type { EngineWarning } from '../errors';
import { middlebrookCheck } from '../inputfilter/analyzeInputFilter';
import { defaultSweepRange, logGrid } from '../sweep/grid';
import { rootFreqHz } from '../tf';
import { formatEng } from '../../units/format';

/** Points of the Middlebrook grid at each corner (two decades below f0 to fsw/2). */
const FILTER_GRID_POINTS = 200;

export function cornerChecksFor(doc: DesignDocument): CornerCheck {
	const opamp = doc.compensator.opamp ?? null;
	const filter = doc.inputFilter;
	return (built, m, spec, variation) => {
		const out: EngineWarning[] = [];
		// The RHP rule is a design rule over the operating range, as the starter design applies
		// it (crossoverLimit.ts); part tolerances reach the verdict through PM and GM.
		const nominalParts = Object.values(variation.factors ?? {}).every((f) => f === 1) && !variation.branchFactors;
		const rhp = nominalParts ? rhpZeroWarning(m.crossoverHz, built.plant.features.rhpZeroHz) : null;
		if (rhp) out.push(rhp);
		if (opamp && m.crossoverHz !== null && spec.parts.kind !== 'type2-ota') {
			const poles = idealCompensatorTf(spec.parts).poles.map(rootFreqHz);
			out.push(...opampWarnings(spec.parts, opamp, m.crossoverHz, poles));
		}
		if (filter) {
			const grid = logGrid(...rangeOf(built.plant.features.f0Hz, spec.stage.fswHz), FILTER_GRID_POINTS);
			const check = middlebrookCheck({ l: filter.l, dcr: filter.dcr, c: filter.c, damping: filter.damping, marginDb: filter.marginDb }, built.plant, grid).middlebrook;
			if (!check.pass) {
				const n = check.marginNDb < check.marginDDb;
				const margin = n ? check.marginNDb : check.marginDDb;
				out.push({
					code: 'input-filter-middlebrook',
					message: `The input filter's |Zs| comes within ${margin.toFixed(1)} dB of ${n ? '|ZN|' : '|ZD|'} near ${formatEng(n ? check.marginNHz : check.marginDHz, 'Hz')} (${check.requiredDb} dB required by Middlebrook's criterion): the filter reshapes the loop.`
				});
			}
		}
		return out;
	};
}

function rangeOf(f0Hz: number, fswHz: number): [number, number] {
	const r = defaultSweepRange(f0Hz, fswHz);
	return [r.startHz, r.stopHz];
}
