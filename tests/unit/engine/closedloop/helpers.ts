// Shared fixtures for the closed-loop tests: the reference design cases analysed by the engine.
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { analyzeDesignDetailed, type AnalysisDetail } from '../../../../src/lib/engine/analyze';
import { analyzeClosedLoop, type ClosedLoopSection } from '../../../../src/lib/engine/closedloop/analyzeClosedLoop';
import { modulatorTf } from '../../../../src/lib/engine/plants/modulator';

export const ROOT = join(__dirname, '..', '..', '..', '..');
export const CASES = readdirSync(join(ROOT, 'reference', 'cases'))
	.filter((f) => f.endsWith('.json'))
	.map((f) => f.replace(/\.json$/, ''))
	.sort();

export function caseDoc(name: string): Record<string, any> {
	return JSON.parse(readFileSync(join(ROOT, 'reference', 'cases', `${name}.json`), 'utf8'));
}

export function detail(name: string): AnalysisDetail {
	const d = analyzeDesignDetailed(caseDoc(name));
	if ('error' in d) throw new Error(`${name}: ${JSON.stringify(d.error)}`);
	return d;
}

export function closedLoopOf(det: AnalysisDetail, loadStep?: { step?: number; riseTime?: number; referenceStep?: number }): ClosedLoopSection {
	const d = det.document;
	return analyzeClosedLoop({
		plant: det.plant,
		compensator: det.compensator.built,
		modulator: modulatorTf({ vramp: d.modulator.vramp, feedForward: d.modulator.feedForward, delayS: d.modulator.delay }, d.plant.vin),
		dividerRatio: d.feedback.vref / d.plant.vout,
		vout: d.plant.vout,
		capacitors: d.plant.capacitors,
		freqHz: det.response.response.freqHz,
		crossoverHz: det.metrics.crossoverHz,
		phaseMarginDeg: det.metrics.phaseMarginDeg,
		loadStep
	});
}

export function closedRef(name: string): Record<string, any> {
	return JSON.parse(readFileSync(join(ROOT, 'reference', 'closedloop', 'out', `${name}.json`), 'utf8'));
}
