/**
 * Peak current mode in the switching model (switching/comparator.ts) against the exact switching
 * simulation of reference/currentmode (numpy/scipy: matrix exponentials per interval, Newton on the
 * comparator, T = −Y/X by sine injection over whole periods; it shares no code with the engine).
 *
 * Tolerance of the loop gain: 0.01 dB and 0.1°. Both sides solve the same piecewise-linear circuit
 * exactly and here inject the same sine, so what is left is numerical: the reference's settling,
 * which its two consecutive windows bound far below that (settleDelta* ≤ 1e-9 dB in its JSON), and
 * its Gauss–Legendre quadrature of smooth exponentials. A wrong sign, slope or sampling instant in
 * the comparator moves T by tenths of a dB at least (the averaged model, a close approximation,
 * is 0.2–0.3 dB and ~1° away below fsw/5: reference/currentmode/README.md).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesignDetailed } from '$lib/engine/analyze';
import { switchingCheckInputOf } from '$lib/engine/pipeline/switchingCircuit';
import { orbitOf, switchingCheck } from '$lib/engine/switching/check';
import { switchedSystem } from '$lib/engine/switching/circuit';
import { Propagator } from '$lib/engine/switching/cycle';
import { measureLoopGain } from '$lib/engine/switching/measure';
import { readMultipliers } from '$lib/engine/switching/steadyState';
import { expectJacobianMatchesMap } from './periodMapCheck';

const DIR = path.resolve('reference/currentmode');
const read = <T>(...parts: string[]) => JSON.parse(readFileSync(path.join(DIR, ...parts), 'utf8')) as T;
const CASES = ['buck-d028-mc13', 'buck-d066-mc17', 'buck-d052-mc11', 'boost-d058-rhp', 'buck-polymer-fc-fsw10'];

interface SimResult {
	simulatedDuty: number;
	injectionAmplitudeV: number;
	points: { freqHz: number; magDb: number; phaseDeg: number }[];
}

type Doc = Record<string, any>;
function inputOf(doc: Doc) {
	const d = analyzeDesignDetailed(doc, { includeResponse: false });
	if ('error' in d) throw new Error(d.error.message);
	return switchingCheckInputOf(d);
}
const withRamp = (doc: Doc, se: number): Doc => ({ ...doc, modulator: { ...doc.modulator, rampSlope: se } });
const phaseGap = (a: number, b: number) => Math.abs(((((a - b) % 360) + 540) % 360) - 180);

describe.each(CASES)('peak current mode %s: switching model vs the scipy switching simulation', (name) => {
	const doc = read<Doc>('cases', `${name}.json`);
	const sim = read<SimResult>('out', `${name}.json`);
	const fsw = doc.plant.fsw as number;
	const input = inputOf(doc);

	it('the design is inside the switching model and its periodic orbit is stable at the simulated duty', () => {
		expect(input.outsideReach).toBeNull();
		const { orbit } = orbitOf(input);
		expect(orbit.converged).toBe(true);
		// The reference ran 3000 periods into steady state (its duty moved < 1e-12 over the last 50).
		expect(Math.abs(orbit.duty - sim.simulatedDuty)).toBeLessThan(1e-6);
		expect(readMultipliers(orbit.multipliers)).toBe('stable');
	});

	it('loop gain within 0.01 dB and 0.1° at every reference frequency of the form fsw/N', () => {
		const { orbit } = orbitOf(input);
		const shared = sim.points.filter((p) => Math.abs(fsw / p.freqHz - Math.round(fsw / p.freqHz)) < 1e-9);
		expect(shared.length).toBe(10); // fsw/200 … fsw/5; fsw/3.33, fsw/2.5, fsw/2.22 are not whole periods
		for (const p of shared) {
			const m = measureLoopGain({ circuit: input.circuit, orbit }, Math.round(fsw / p.freqHz), sim.injectionAmplitudeV);
			expect(Math.abs(m.magDb - p.magDb), `${name} |T| at ${p.freqHz} Hz: ${m.magDb} against ${p.magDb}`).toBeLessThan(0.01);
			expect(phaseGap(m.phaseDeg, p.phaseDeg), `${name} ∠T at ${p.freqHz} Hz: ${m.phaseDeg} against ${p.phaseDeg}`).toBeLessThan(0.1);
		}
	}, 30_000);
});

describe('the switching check runs a peak current-mode design', () => {
	it('the D > 0.5 buck: agrees with the averaged model, and its own injection gives the reference T', () => {
		const doc = read<Doc>('cases', 'buck-d052-mc11.json');
		const sim = read<SimResult>('out', 'buck-d052-mc11.json');
		const r = switchingCheck(inputOf(doc));
		expect(r.status).toBe('agrees');
		expect(r.orbit?.reading).toBe('stable');
		// The check injects ~25× less than the reference (0.1 % of duty instead of 0.3 % of Vout):
		// the same T at the frequency both measured shows the measurement is linear.
		const p = r.points.find((q) => q.periods === 25)!;
		const ref = sim.points.find((q) => q.freqHz === 20000)!;
		expect(Math.abs(p.magDb - ref.magDb)).toBeLessThan(0.01);
		expect(phaseGap(p.phaseDeg, ref.phaseDeg)).toBeLessThan(0.1);
		// Crossover and margin: the README of reference/currentmode gives 20.4 kHz / 59.6° for the
		// simulation (interpolated between 20 and 25 kHz, so only to a few hundred Hz).
		expect(Math.abs(r.switching.crossoverHz! / 20.4e3 - 1)).toBeLessThan(0.02);
		expect(Math.abs(r.switching.phaseMarginDeg! - 59.6)).toBeLessThan(0.5);
		expect(Math.abs(r.linearity!.deltaDb)).toBeLessThan(0.01);
	}, 30_000);
});

describe('subharmonic oscillation through the Floquet multipliers (buck D ≈ 0.53)', () => {
	type Run = { rampSlope: number; fswHalfAmplitude: number; alternatingSteps: number };
	const sub = read<{ sn: number; sf: number; boundary: number; runs: Run[] }>('out', 'subharmonic.json');
	const doc = read<Doc>('cases', 'buck-d052-mc11.json');
	const currentLoopMultiplier = (se: number) => {
		const { orbit } = orbitOf(inputOf(withRamp(doc, se)));
		expect(orbit.converged).toBe(true);
		return { orbit, lowest: orbit.multipliers.reduce((m, z) => (z.re < m.re ? z : m)) };
	};

	it('Se = 0: a real multiplier beyond −1, equal to the ripple map −(Sf − Se)/(Sn + Se), and period two in words', () => {
		const { orbit, lowest } = currentLoopMultiplier(0);
		// [published: Ridley 1991 / E&M ch. 12, the valley-current map; slopes Sn, Sf from the
		// simulated circuit in subharmonic.json]. 2 %: the circuit's slopes vary over the interval
		// with IL·r and the output ripple, the map takes them constant.
		const alpha = -sub.sf / sub.sn;
		expect(lowest.re).toBeLessThan(-1);
		expect(Math.abs(lowest.im)).toBeLessThan(1e-9);
		expect(Math.abs(lowest.re / alpha - 1)).toBeLessThan(0.02);
		expect(readMultipliers(orbit.multipliers)).toBe('period-two');
		// and the simulated circuit does alternate long and short cycles there
		expect(sub.runs[0].rampSlope).toBe(0);
		expect(sub.runs[0].alternatingSteps).toBeGreaterThan(0.9);
		const r = switchingCheck(inputOf(withRamp(doc, 0)));
		expect(r.status).toBe('not-run');
		expect(r.orbit?.reading).toBe('period-two');
		expect(r.reason).toMatch(/alternates from one period to the next/);
	});

	it('the multiplier crosses −1 between 0.9 and 1.1 × the boundary ramp, where the simulation stops alternating', () => {
		const [, below, above] = sub.runs;
		expect(below.alternatingSteps).toBeGreaterThan(0.9);
		expect(above.fswHalfAmplitude).toBeLessThan(1e-6);
		expect(currentLoopMultiplier(below.rampSlope).lowest.re).toBeLessThan(-1);
		const steady = currentLoopMultiplier(above.rampSlope);
		expect(steady.lowest.re).toBeGreaterThan(-1);
		expect(readMultipliers(steady.orbit.multipliers)).toBe('near-period-two');
	});
});

type Multiplier = { re: number; im: number };
interface FloquetRef {
	cases: Record<string, { duty: number; multipliers: Multiplier[] }>;
	subharmonic: { rampSlope: number; duty: number; multipliers: Multiplier[] }[];
}

/** Largest distance from a reference multiplier to the nearest of the engine's (same count). */
function multiplierGap(engine: readonly Multiplier[], ref: readonly Multiplier[]): number {
	expect(engine.length).toBe(ref.length);
	return Math.max(...ref.map((r) => Math.min(...engine.map((e) => Math.hypot(e.re - r.re, e.im - r.im)))));
}

describe("Floquet multipliers against the simulated circuit's own period map (reference/currentmode/floquet.py)", () => {
	// The reference differentiates the scipy simulator's one-period map by central differences
	// at its Newton fixed point (no saltation formula, no engine code): 1e-5 covers the
	// differencing error (step 1e-6 relative) with room; the engine's Jacobian is exact.
	const ref = read<FloquetRef>('out', 'floquet.json');
	it.each(CASES)('%s: the same multipliers within 1e-5', (name) => {
		const { orbit } = orbitOf(inputOf(read<Doc>('cases', `${name}.json`)));
		expect(Math.abs(orbit.duty - ref.cases[name].duty)).toBeLessThan(1e-9);
		expect(multiplierGap(orbit.multipliers, ref.cases[name].multipliers)).toBeLessThan(1e-5);
	});
	it('the D ≈ 0.53 buck without a ramp and at 0.9 and 1.1 × the boundary ramp: the same multipliers, one passing −1', () => {
		const doc = read<Doc>('cases', 'buck-d052-mc11.json');
		const lowest: number[] = [];
		for (const run of ref.subharmonic) {
			const { orbit } = orbitOf(inputOf(withRamp(doc, run.rampSlope)));
			expect(multiplierGap(orbit.multipliers, run.multipliers), `Se ${run.rampSlope}`).toBeLessThan(1e-5);
			lowest.push(Math.min(...run.multipliers.map((m) => m.re)));
		}
		expect(lowest[0]).toBeLessThan(-1);
		expect(lowest[1]).toBeLessThan(-1);
		expect(lowest[2]).toBeGreaterThan(-1);
	});
});

const hasPythonScipy = spawnSync('python3', ['-c', 'import numpy, scipy'], { stdio: 'ignore' }).status === 0;

describe.runIf(hasPythonScipy)('the multipliers regenerate to the committed numbers', () => {
	it('re-runs reference/currentmode/floquet.py and diffs', () => {
		const out = mkdtempSync(path.join(tmpdir(), 'loopwright-floquet-'));
		try {
			const run = spawnSync('python3', [path.join(DIR, 'floquet.py'), '--out', out], { encoding: 'utf8', timeout: 110_000 });
			expect(run.status, run.stderr).toBe(0);
			const fresh = JSON.parse(readFileSync(path.join(out, 'floquet.json'), 'utf8')) as FloquetRef;
			const committed = read<FloquetRef>('out', 'floquet.json');
			// Same script on another numpy/scipy build moves only the last digits.
			for (const name of CASES) expect(multiplierGap(fresh.cases[name].multipliers, committed.cases[name].multipliers)).toBeLessThan(1e-8);
			committed.subharmonic.forEach((r, i) => expect(multiplierGap(fresh.subharmonic[i].multipliers, r.multipliers)).toBeLessThan(1e-8));
		} finally {
			rmSync(out, { recursive: true, force: true });
		}
	}, 120_000);
});

describe('the cycle of peak current mode', () => {
	const doc = read<Doc>('cases', 'boost-d058-rhp.json');
	const input = inputOf(doc);

	it('has a period-map Jacobian (saltation with the sensed-current row) equal to finite differences', () => {
		// [derived]: the Jacobian is checked against the map itself, column by column.
		const { orbit, prop } = orbitOf(input);
		expectJacobianMatchesMap((x) => prop.cycle(x).x1, orbit.x0, orbit.monodromy, 1e-5);
	});

	it("a maximum duty below the comparator's turn-off ends the on interval by the clock, without saltation", () => {
		const { orbit } = orbitOf(input);
		const maxDuty = 0.55; // the orbit turns off at D ≈ 0.59
		const sys = switchedSystem({ ...input.circuit, currentMode: { ...input.circuit.currentMode!, maxDuty } }, { omega: 0, amplitude: 0 });
		const prop = new Propagator(sys, input.circuit.fswHz);
		const r = prop.cycle(orbit.x0);
		expect(r.forced).toBe(true);
		expect(r.tOff).toBeCloseTo(maxDuty / input.circuit.fswHz, 15);
		// [derived] the clock-ended interval: the map's derivative is the plain product of the flows
		expectJacobianMatchesMap((x) => prop.cycle(x).x1, orbit.x0, prop.jacobian(r), 1e-4);
		// A maximum duty above the turn-off changes nothing.
		const loose = new Propagator(switchedSystem({ ...input.circuit, currentMode: { ...input.circuit.currentMode!, maxDuty: 0.9 } }, { omega: 0, amplitude: 0 }), input.circuit.fswHz);
		const free = loose.cycle(orbit.x0);
		expect(free.forced).toBe(false);
		expect(Math.abs(free.tOff - orbit.cycle.tOff)).toBeLessThan(1e-15);
	});
});

describe('peak current mode outside practice', () => {
	it('a sense gain of 1 µV/A without a ramp (practice: about 0.01–1 V/A [common practice]) is not run, with the reason in words', () => {
		const doc = read<Doc>('cases', 'buck-d066-mc17.json');
		const r = switchingCheck(inputOf({ ...doc, modulator: { ...doc.modulator, senseGain: 1e-6, rampSlope: 0 } }));
		expect(r.status).toBe('not-run');
		expect(r.reason).toMatch(/no regulating steady state/);
		expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
	});
});
