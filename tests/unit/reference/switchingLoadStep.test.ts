/**
 * The load step on the switching model (engine switching/loadStep.ts) against an ngspice switching
 * transient of the same buck (reference/switching/loadstep.py: the circuit of generate.py settled,
 * then a 1 A load step with a 1 ns edge at a clock edge; V(out) at every following clock edge,
 * minus its value at the step), and beside the averaged model's step (closed loop, −Zo,cl·ΔI).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesign, analyzeDesignDetailed } from '$lib/engine/analyze';
import { switchingCheckInputOf } from '$lib/engine/pipeline/switchingCircuit';
import { switchingLoadStep } from '$lib/engine/switching/loadStep';

const dir = path.resolve('reference/switching');
const load = <T>(p: string) => JSON.parse(readFileSync(path.join(dir, p), 'utf8')) as T;

describe('load step on the switching model of a buck', () => {
	const doc = load<Record<string, unknown>>('cases/buck-12v-3v3.json');
	const spice = load<{ stepA: number; timeS: number[]; deviationV: number[] }>('out/buck-12v-3v3.loadstep.json');
	const detail = analyzeDesignDetailed(doc, { includeResponse: false });
	if ('error' in detail) throw new Error(detail.error.message);
	const r = switchingLoadStep(switchingCheckInputOf(detail), spice.stepA, spice.timeS.at(-1)!);
	if ('reason' in r) throw new Error(r.reason);

	it("follows ngspice's switching transient at every clock edge within 1 % of the peak", () => {
		expect(r.timeS.length).toBe(spice.timeS.length);
		const peak = Math.max(...spice.deviationV.map(Math.abs));
		for (let k = 0; k < r.timeS.length; k++) {
			expect(r.timeS[k]).toBeCloseTo(spice.timeS[k], 12);
			expect(Math.abs(r.deviationV[k] - spice.deviationV[k]), `edge ${k}`).toBeLessThan(0.01 * peak);
		}
	});

	it('has the averaged model’s peak deviation within 10 % where averaging holds (fc ≈ fsw/12)', () => {
		// [published: E&M Ch. 7 — averaging holds for signals well below fsw]. The averaged step keeps
		// its 1 µs edge: with no edge at all the bank's ESL opens and Zo,cl(∞) = Rload makes a jump of
		// ΔI·Rload that lasts ESL/Rload, which the clock-edge samples of the switched step never see.
		const averaged = analyzeDesign({ ...doc, loadStep: { step: spice.stepA, riseTime: 1e-6 } });
		if ('error' in averaged) throw new Error(averaged.error.message);
		const avgPeak = averaged.closedLoop!.loadStep!.figures.peakDeviation;
		expect(Math.sign(r.peakV)).toBe(Math.sign(avgPeak));
		expect(Math.abs(r.peakV / avgPeak - 1)).toBeLessThan(0.1);
	});
});
