/**
 * The switching model (engine switching/) against outside facts: where averaging holds (a buck
 * crossing over near fsw/12) its measured loop gain equals the averaged model's within 0.3 dB and
 * 1°; its steady state has the averaged duty; the saltation Jacobian equals the period map's finite
 * differences; the injection is small enough that halving it changes nothing measurable.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { analyzeDesignDetailed } from '$lib/engine/analyze';
import { switchingCheckInputOf } from '$lib/engine/pipeline/switchingCircuit';
import { defaultCheckFrequencies, MAX_PERIODS_PER_POINT, orbitOf, switchingCheck } from '$lib/engine/switching/check';
import { Propagator } from '$lib/engine/switching/cycle';
import { readMultipliers } from '$lib/engine/switching/steadyState';
import { expectJacobianMatchesMap } from './periodMapCheck';

const caseDoc = (name: string) =>
	JSON.parse(readFileSync(path.resolve('reference/switching/cases', `${name}.json`), 'utf8')) as Record<string, unknown>;

function detailOf(doc: unknown) {
	const d = analyzeDesignDetailed(doc, { includeResponse: false });
	if ('error' in d) throw new Error(d.error.message);
	return d;
}

describe('switching model of a buck where averaging holds', () => {
	const detail = detailOf(caseDoc('buck-12v-3v3'));
	const input = switchingCheckInputOf(detail);

	it('finds the periodic steady state at the averaged duty and calls it stable', () => {
		const { orbit } = orbitOf(input);
		expect(orbit.converged).toBe(true);
		// [published: E&M Ch. 3, D = V(R + r)/(Vg·R) for the buck with series resistance]; the
		// integrator holds the average output at Vref·(1 + R1/Rb), the ripple moves D by ~1e-4.
		expect(Math.abs(orbit.duty - detail.plant.operatingPoint.duty)).toBeLessThan(1e-3);
		expect(orbit.spectralRadius).toBeLessThan(1);
		expect(readMultipliers(orbit.multipliers)).toBe('stable');
	});

	it('measures the averaged loop gain within 0.3 dB and 1° up to fsw/3, and the same margin', () => {
		const r = switchingCheck(input);
		expect(r.status).toBe('agrees');
		expect(r.points.length).toBeGreaterThanOrEqual(8);
		for (const p of r.points) {
			// [published: E&M Ch. 7 — the averaged model holds for signals slow against fsw]
			expect(Math.abs(p.magDb - p.averagedMagDb), `|T| at ${p.freqHz} Hz`).toBeLessThan(0.3);
			expect(Math.abs(p.phaseUnwrappedDeg - p.averagedPhaseDeg), `∠T at ${p.freqHz} Hz`).toBeLessThan(1);
		}
		expect(Math.abs(r.switching.phaseMarginDeg! - r.averaged.phaseMarginDeg!)).toBeLessThan(1);
		expect(Math.abs(r.switching.crossoverHz! / r.averaged.crossoverHz! - 1)).toBeLessThan(0.02);
		// Halving the injection changes T by far less than the tolerance: the measurement is linear.
		expect(Math.abs(r.linearity!.deltaDb)).toBeLessThan(0.01);
		expect(Math.abs(r.linearity!.deltaDeg)).toBeLessThan(0.05);
	});

	it('counts every measurement in its progress, the points added beside the crossover and the linearity repeat included', () => {
		// [derived: one progress call per measurement] Four requested points far from fc (42.6 kHz):
		// the crossover search adds fsw/11 and fsw/12, so a total of the requested points alone
		// would reach 100 % before the end.
		const progress: [number, number][] = [];
		const r = switchingCheck(input, { freqHz: [4e3, 10e3, 100e3, 150e3], onProgress: (done, total) => progress.push([done, total]) });
		expect(r.points.length).toBeGreaterThan(4);
		const measurements = r.points.length + (r.linearity ? 1 : 0);
		expect(progress.at(-1)).toEqual([measurements, measurements]);
		expect(progress.map(([done]) => done)).toEqual(Array.from({ length: measurements }, (_, i) => i + 1));
		for (let i = 0; i < progress.length; i++) {
			const [done, total] = progress[i];
			expect(done).toBeLessThanOrEqual(total);
			if (i > 0) expect(done / total).toBeGreaterThanOrEqual(progress[i - 1][0] / progress[i - 1][1]);
			if (i < progress.length - 1) expect(done).toBeLessThan(total);
		}
	});

	it('has a period-map Jacobian (with the saltation at the turn-off instant) equal to finite differences', () => {
		// [derived]: the Jacobian is checked against the map itself, column by column.
		const { orbit, prop } = orbitOf(input);
		expectJacobianMatchesMap((x) => prop.cycle(x).x1, orbit.x0, orbit.monodromy, 1e-4);
	});
});

describe('switching model of a light-load boost with a Type III network', () => {
	const detail = detailOf(caseDoc('boost-5v-12v-light'));
	const r = switchingCheck(switchingCheckInputOf(detail));

	it('reports a smaller phase margin than the averaged model and cautions with the causes', () => {
		// The averaged model gives 59.5° here; the switching transient in ngspice gives the lower
		// figure too (reference/switching, compared point by point in tests/unit/reference).
		expect(r.status).toBe('differs');
		expect(r.averaged.phaseMarginDeg! - r.switching.phaseMarginDeg!).toBeGreaterThan(3);
		expect(r.caution).toMatch(/differs from the averaged/);
		expect(r.caution).toMatch(/Usual causes/);
	});

	it('says the inductor current reverses (synchronous switches keep it in CCM)', () => {
		// [published: E&M Ch. 2 — boost ripple ΔiL = Vg·D·Ts/L = 0.73 A here, above twice the
		// 0.24 A average inductor current, so the valley is negative]
		expect(r.orbit!.valleyCurrent).toBeLessThan(0);
		expect(r.notes.join(' ')).toMatch(/reverses/);
	});
});

describe('switching check refusals', () => {
	it('does not run with a loop delay, and says why', () => {
		const doc = caseDoc('buck-12v-3v3') as { modulator: Record<string, unknown> };
		const r = switchingCheck(switchingCheckInputOf(detailOf({ ...doc, modulator: { ...doc.modulator, delay: 1e-7 } })));
		expect(r.status).toBe('not-run');
		expect(r.reason).toMatch(/delay/);
	});
});

describe('the switching check keeps each measured point within its period limit', () => {
	// [derived: docs/formulas.md §13.4] a point at f is measured over N = fsw/f switching periods,
	// each chord iteration running all N; fsw/2000 at 500 kHz is 250 Hz.
	const slow = { ...caseDoc('buck-12v-3v3'), compensator: { kind: 'type2', target: { method: 'k-factor', crossoverHz: 30, phaseMarginDeg: 60 } } };

	it('does not run a design crossing over at tens of hertz, and says the limit', () => {
		const input = switchingCheckInputOf(detailOf(slow));
		// About 17 000 periods per point at fc and 170 000 at fc/10: minutes of CPU without the limit.
		expect(input.averaged.crossoverHz!).toBeLessThan(500e3 / MAX_PERIODS_PER_POINT);
		// Counted work, not time: a runaway measurement stops at the first thousand periods.
		let periods = 0;
		const cycle = Propagator.prototype.cycle;
		const spy = vi.spyOn(Propagator.prototype, 'cycle').mockImplementation(function (this: Propagator, x: Float64Array) {
			if (++periods > 1000) throw new Error('more than 1000 switching periods simulated');
			return cycle.call(this, x);
		});
		let r: ReturnType<typeof switchingCheck>;
		try {
			r = switchingCheck(input);
		} finally {
			spy.mockRestore();
		}
		expect(periods).toBeLessThan(1000);
		expect(r.status).toBe('not-run');
		expect(r.points).toEqual([]);
		expect(r.reason).toMatch(/crossover \(29\.\d Hz\) is below fsw\/2000 \(250 Hz\)/);
		expect(r.reason).toMatch(/at most 2000 switching periods per point/);
	}, 30_000);

	it('does not run a requested frequency below fsw/2000, naming it', () => {
		const r = switchingCheck(switchingCheckInputOf(detailOf(caseDoc('buck-12v-3v3'))), { freqHz: [100, 40e3] });
		expect(r.status).toBe('not-run');
		expect(r.reason).toMatch(/frequency 100 Hz is below fsw\/2000/);
	}, 30_000);

	it('leaves out of its default frequencies those below fsw/2000', () => {
		// fc = 1 kHz at 500 kHz: fc/10 (5000 periods) and fc/5 (2500) go, fc/2 (1000) stays.
		const f = defaultCheckFrequencies(1000, 500e3);
		expect(Math.min(...f)).toBe(500);
		expect(f).toEqual([500, 2000, 5000, 10000, 50e3, 100e3, 500e3 / 3]);
	});
});
