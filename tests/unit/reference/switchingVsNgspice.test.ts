/**
 * The switching model's measured loop gain against ngspice switching transients of the same
 * circuits (reference/switching: ideal switches, a latched trailing-edge comparator, the sine
 * injected in the feedback path, one-bin DFT over one whole injection period after settling;
 * tools and versions in each JSON). Same frequencies fsw/N and the same 10 mV amplitude.
 * Tolerance 0.1 dB and 1°: ngspice's own step control and its 1 ns latch, not the model, set it.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesignDetailed } from '$lib/engine/analyze';
import { evaluatePolar } from '$lib/engine/tf/evaluate';
import { switchingCheckInputOf } from '$lib/engine/pipeline/switchingCircuit';
import { orbitOf, switchingCheck } from '$lib/engine/switching/check';
import { measureLoopGain } from '$lib/engine/switching/measure';

interface SpicePoint {
	periods: number;
	freqHz: number;
	amplitude: number;
	magDb: number;
	phaseDeg: number;
}
const dir = path.resolve('reference/switching');
const load = <T>(p: string) => JSON.parse(readFileSync(path.join(dir, p), 'utf8')) as T;
const wrap = (deg: number) => deg - 360 * Math.round(deg / 360);

describe.each(['buck-12v-3v3', 'boost-5v-12v-light', 'boost-5v-12v-low-zeros'])('switching model %s vs ngspice transients', (name) => {
	const detail = analyzeDesignDetailed(load(`cases/${name}.json`), { includeResponse: false });
	if ('error' in detail) throw new Error(detail.error.message);
	const input = switchingCheckInputOf(detail);
	const { orbit } = orbitOf(input);
	const spice = load<{ points: SpicePoint[] }>(`out/${name}.json`);

	it.each(spice.points.map((p) => [p.periods, p] as const))('T at fsw/%i within 0.1 dB and 1°', (_n, ref) => {
		const m = measureLoopGain({ circuit: input.circuit, orbit }, ref.periods, ref.amplitude);
		expect(m.freqHz).toBeCloseTo(ref.freqHz, 6);
		expect(Math.abs(m.magDb - ref.magDb), `${name} |T| at ${ref.freqHz} Hz`).toBeLessThan(0.1);
		expect(Math.abs(wrap(m.phaseDeg - ref.phaseDeg)), `${name} ∠T at ${ref.freqHz} Hz`).toBeLessThan(1);
	});
});

describe('where averaging fails, ngspice sides with the switching model', () => {
	it('the light-load boost near its LC resonance: the averaged phase is tens of degrees off', () => {
		const detail = analyzeDesignDetailed(load('cases/boost-5v-12v-light.json'), { includeResponse: false });
		if ('error' in detail) throw new Error(detail.error.message);
		const ref = load<{ points: SpicePoint[] }>('out/boost-5v-12v-light.json').points.find((p) => p.periods === 148)!;
		const avg = evaluatePolar(detail.loop, 2 * Math.PI * ref.freqHz);
		expect(Math.abs(wrap(avg.phaseDeg - ref.phaseDeg))).toBeGreaterThan(20);
	});
});

describe('the light-load boost with its network zeros below f0 (averaged PM 58.7° at 12.6 kHz)', () => {
	it("has the switching PM of ngspice's transients, about 9° below the averaged one, and cautions", () => {
		const name = 'boost-5v-12v-low-zeros';
		const detail = analyzeDesignDetailed(load(`cases/${name}.json`), { includeResponse: false });
		if ('error' in detail) throw new Error(detail.error.message);
		const r = switchingCheck(switchingCheckInputOf(detail));
		// [derived from the parts: the network placed with its zeros at 0.75·f0 and poles at 0.253·fsw
		// and fsw/2 for fc 12.6 kHz, PM 58.7°, rounded to 4 digits]
		expect(r.averaged.phaseMarginDeg!).toBeCloseTo(58.7, 1);
		expect(r.averaged.crossoverHz! / 12.6e3).toBeCloseTo(1, 2);
		// ngspice: the crossover from fsw/32 and fsw/31 (both just below 0 dB), extrapolated in log f.
		const spice = load<{ points: SpicePoint[] }>(`out/${name}.json`).points;
		const a = spice.find((p) => p.periods === 32)!;
		const b = spice.find((p) => p.periods === 31)!;
		const u = a.magDb / (a.magDb - b.magDb);
		const spicePm = 180 + a.phaseDeg + u * (b.phaseDeg - a.phaseDeg);
		expect(Math.abs(r.switching.phaseMarginDeg! - spicePm)).toBeLessThan(1);
		expect(r.averaged.phaseMarginDeg! - r.switching.phaseMarginDeg!).toBeGreaterThan(7);
		expect(r.status).toBe('differs');
		expect(r.caution).toMatch(/Usual causes/);
	});
});

