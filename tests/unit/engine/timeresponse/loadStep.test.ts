import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { modalEdgeResponse, modalForm } from '../../../../src/lib/engine/timeresponse/modal';
import { realise } from '../../../../src/lib/engine/timeresponse/realisation';
import { simulatePiecewiseLinear } from '../../../../src/lib/engine/timeresponse/simulate';
import { stepResponse } from '../../../../src/lib/engine/timeresponse/stepResponse';
import { loadStepRuleOfThumb } from '../../../../src/lib/engine/timeresponse/ruleOfThumb';
import type { FactoredTf } from '../../../../src/lib/engine/tf/types';
import { CASES, ROOT, closedLoopOf, closedRef, detail } from '../closedloop/helpers';

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('load step against scipy lsim and ngspice transient', () => {
	for (const name of CASES) {
		const ref = closedRef(name);
		const spec = ref.scipy.loadStep;
		const cl = closedLoopOf(detail(name), { step: spec.step, riseTime: spec.riseTime, referenceStep: ref.scipy.referenceStep.step });
		const ls = cl.loadStep!;
		it(`${name}: peak and 2 % settling within 0.2 % of scipy`, () => {
			// [scipy: signal.lsim of the closed-loop state space built from the circuit, reference/closedloop/generate.py]
			expect(ls, `${name} load step`).not.toBeNull();
			expect(rel(ls.figures.peakDeviation, spec.peakDeviation), `${name} peak`).toBeLessThan(2e-3);
			expect(rel(ls.figures.settlingTimeS!, spec.settlingTimeS), `${name} settling`).toBeLessThan(2e-3);
			expect(rel(ls.figures.peakTimeS, spec.peakTimeS), `${name} peak time`).toBeLessThan(5e-3);
		});
		it(`${name}: peak and 2 % settling within 2 % of ngspice`, () => {
			// [ngspice-39 transient of the averaged closed-loop netlist, reference/closedloop/netlists]
			const ng = ref.ngspice;
			expect(rel(ls.figures.peakDeviation, ng.peakDeviation), `${name} peak vs ngspice`).toBeLessThan(0.02);
			expect(rel(ls.figures.settlingTimeS!, ng.settlingTimeS), `${name} settling vs ngspice`).toBeLessThan(0.02);
		});
		it(`${name}: reference step overshoot and settling against scipy.signal.step`, () => {
			const r = cl.referenceStep!;
			const s = ref.scipy.referenceStep;
			expect(rel(r.figures.peakDeviation, s.peakDeviation)).toBeLessThan(2e-3);
			expect(rel(r.figures.finalValue, s.finalValue)).toBeLessThan(1e-6);
			expect(rel(r.figures.settlingTimeS!, s.settlingTimeS)).toBeLessThan(5e-3);
			expect(Math.abs(r.figures.overshoot - s.overshoot)).toBeLessThan(2e-3 * Math.abs(s.finalValue));
		});
	}
});

describe('reference generator', () => {
	const hasTools = spawnSync('ngspice', ['-v']).status === 0 && spawnSync('python3', ['-c', 'import scipy']).status === 0;
	it.runIf(hasTools)('re-running reference/closedloop/generate.py reproduces the committed buck-ceramic-1v2 figures', () => {
		const dir = mkdtempSync(join(tmpdir(), 'lw-closedloop-'));
		try {
			execFileSync('python3', [join(ROOT, 'reference', 'closedloop', 'generate.py'), '--only', 'buck-ceramic-1v2', '--out', dir, '--netlists', dir], { timeout: 120000 });
			const fresh = JSON.parse(readFileSync(join(dir, 'buck-ceramic-1v2.json'), 'utf8'));
			const old = closedRef('buck-ceramic-1v2');
			for (const src of ['scipy', 'ngspice'] as const) {
				const a = src === 'scipy' ? fresh.scipy.loadStep : fresh.ngspice;
				const b = src === 'scipy' ? old.scipy.loadStep : old.ngspice;
				expect(rel(a.peakDeviation, b.peakDeviation), `${src} peak`).toBeLessThan(1e-6);
				expect(rel(a.settlingTimeS, b.settlingTimeS), `${src} settling`).toBeLessThan(1e-6);
			}
		} finally {
			rmSync(dir, { recursive: true, force: true });
		}
	}, 150000);
});

describe('hand-derivable step responses', () => {
	const first: FactoredTf = { gain: 2, originPower: 0, zeros: [], poles: [{ kind: 'real', omega: 1000 }] };
	it('first-order lag: y = 2(1 − e^(−ωt)), 2 % settling at ln(50)/ω [hand-derived]', () => {
		const r = stepResponse(first, 1, 0, 'tracking', { durationS: 0.02, steps: 20000 });
		expect(r.figures.finalValue).toBe(2);
		expect(r.figures.settlingTimeS!).toBeCloseTo(Math.log(50) / 1000, 6);
		expect(r.figures.overshoot).toBe(0);
		// 10–90 % rise time ln(9)/ω [hand-derived]
		expect(r.figures.riseTimeS!).toBeCloseTo(Math.log(9) / 1000, 6);
	});

	it('modal and state-space (exact discretisation) agree with the closed form for a ramp input', () => {
		// Ramp of 1 over 1 ms into 1/(1 + s/ω): y = t/τr − (1 − e^(−ωt))/(ωτr) during the ramp [hand-derived]
		const g: FactoredTf = { ...first, gain: 1 };
		const tr = 1e-3;
		const times = [0.25e-3, 0.5e-3, 1e-3];
		const exact = times.map((t) => t / tr - (1 - Math.exp(-1000 * t)) / (1000 * tr));
		const modal = modalEdgeResponse(modalForm(g), 1, tr, times);
		const ss = simulatePiecewiseLinear(realise(g), 0, [{ durationS: tr, steps: 4, slope: 1 / tr }]);
		times.forEach((t, i) => {
			expect(modal[i]).toBeCloseTo(exact[i], 12);
			expect(ss.value[[1, 2, 4][i]]).toBeCloseTo(exact[i], 12);
		});
	});

	it('second-order overshoot exp(−πζ/sqrt(1 − ζ²)) [published: standard second-order step response, e.g. Ogata, Modern Control Engineering]', () => {
		for (const zeta of [0.2, 0.5, 0.7]) {
			const tf: FactoredTf = { gain: 1, originPower: 0, zeros: [], poles: [{ kind: 'pair', omega0: 2 * Math.PI * 1e4, q: 1 / (2 * zeta) }] };
			const r = stepResponse(tf, 1, 0, 'tracking', { steps: 20000 });
			expect(r.figures.overshootPct / 100).toBeCloseTo(Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta)), 5);
			// Peak time π/(ω0·sqrt(1 − ζ²)) [same source]
			expect(r.figures.peakTimeS).toBeCloseTo(Math.PI / (2 * Math.PI * 1e4 * Math.sqrt(1 - zeta * zeta)), 9);
		}
	});

	it('a closed loop with a pole at the origin has no final value and says so', () => {
		expect(() => stepResponse({ gain: 1, originPower: -1, zeros: [], poles: [{ kind: 'real', omega: 10 }] }, 1, 0, 'tracking')).toThrow(/origin/);
	});
});

describe('load-step rule of thumb', () => {
	it('ΔV ≈ ΔI/(2π·fc·C) for a ceramic bank, with no warning [common practice]', () => {
		const r = loadStepRuleOfThumb({ deltaI: 4, crossoverHz: 60e3, cTotal: 141e-6, esr: 0.00067, phaseMarginDeg: 55 });
		expect(r.capacitiveV).toBeCloseTo(4 / (2 * Math.PI * 60e3 * 141e-6), 12);
		expect(r.applies).toBe(true);
		expect(r.notes).toHaveLength(0);
	});
	it('flags an ESR-dominated bank and takes ΔI·Rc as the estimate [common practice]', () => {
		const r = loadStepRuleOfThumb({ deltaI: 0.25, crossoverHz: 30e3, cTotal: 100e-6, esr: 0.1, esrZeroHz: [15.9e3], phaseMarginDeg: 50 });
		expect(r.applies).toBe(false);
		expect(r.notes.map((n) => n.code)).toEqual(['esr-dominated', 'crossover-above-esr-zero']);
		expect(r.generalV).toBeCloseTo(0.025, 12);
	});
	it('on the ESR-dominated reference case the simulated peak is near ΔI·Rc, not the capacitive rule', () => {
		// buck-lossy-light-5v: one 100 µF part with 0.1 Ω ESR [common practice: the ESR step appears at once]
		const cl = closedLoopOf(detail('buck-lossy-light-5v'), { step: 0.25, riseTime: 1e-6 });
		const ls = cl.loadStep!;
		const peak = Math.abs(ls.figures.peakDeviation);
		expect(ls.ruleOfThumb!.applies).toBe(false);
		expect(Math.abs(peak - ls.ruleOfThumb!.esrStepV) / ls.ruleOfThumb!.esrStepV).toBeLessThan(0.1);
		expect(peak).toBeGreaterThan(1.5 * ls.ruleOfThumb!.capacitiveV);
	});
});

describe('loadStep schema', () => {
	it('defaults the rise time and band, and names bad fields', async () => {
		const { loadStepSchema } = await import('../../../../src/lib/engine/timeresponse/schema');
		expect(loadStepSchema.parse({ step: 2 })).toEqual({ step: 2, riseTime: 1e-6, settleFraction: 0.02 });
		const bad = loadStepSchema.safeParse({ step: 0, riseTime: -1 });
		expect(bad.success).toBe(false);
		expect(bad.error!.issues.map((i) => i.path.join('.'))).toEqual(['step', 'riseTime']);
	});
});

describe('repeated poles', () => {
	it('a double pole (split internally) still gives y = 1 − (1 + ωt)e^(−ωt) [hand-derived]', () => {
		const w = 1000;
		const tf: FactoredTf = { gain: 1, originPower: 0, zeros: [], poles: [{ kind: 'real', omega: w }, { kind: 'real', omega: w }] };
		const r = stepResponse(tf, 1, 0, 'tracking', { durationS: 0.02, steps: 20000 });
		expect(r.method).toBe('modal-split-poles');
		for (const k of [500, 2000, 8000]) {
			const t = r.waveform.timeS[k];
			expect(r.waveform.value[k]).toBeCloseTo(1 - (1 + w * t) * Math.exp(-w * t), 4);
		}
	});
});
