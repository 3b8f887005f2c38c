// Shared fixtures for the closed-loop tests: the reference design cases analysed by the engine.
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { analyzeDesignDetailed, type AnalysisDetail } from '../../../../src/lib/engine/analyze';
import { analyzeClosedLoop, type ClosedLoopSection } from '../../../../src/lib/engine/closedloop/analyzeClosedLoop';
import { closedLoopInputOf } from '../../../../src/lib/engine/closedloop/sections';

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
	return analyzeClosedLoop(closedLoopInputOf(det, det.response.response.freqHz, loadStep));
}

export function closedRef(name: string): Record<string, any> {
	return JSON.parse(readFileSync(join(ROOT, 'reference', 'closedloop', 'out', `${name}.json`), 'utf8'));
}
