import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { closedLoopDenominator, closedLoopTf, isStable } from '../../../../src/lib/engine/closedloop/closedLoopTf';
import { closedLoopResponses } from '../../../../src/lib/engine/closedloop/responses';
import { evaluate } from '../../../../src/lib/engine/tf/evaluate';
import type { FactoredTf } from '../../../../src/lib/engine/tf/types';
import { CASES, ROOT, closedLoopOf, closedRef, detail } from './helpers';

const deg = Math.PI / 180;

describe('closed-loop peaking vs phase margin', () => {
	// [published: E&M §9.4.2, Q = sqrt(cos φm)/sin φm for T = 1/[(s/ωc0)(1 + s/ω2)]; check values from the formula sheet §8.3]
	const cases: [number, number][] = [
		[45, 1.1892],
		[52, 0.99572],
		[60, 0.8165],
		[76, 0.50691]
	];
	for (const [pm, q] of cases) {
		it(`PM ${pm}° gives a closed-loop Q of ${q}`, () => {
			const w2 = 1000;
			const wc = w2 / Math.tan(pm * deg); // ∠T(jωc) = −90° − atan(ωc/ω2) = −180° + PM
			const wc0 = wc * Math.sqrt(1 + (wc / w2) ** 2);
			const loop: FactoredTf = { gain: wc0, originPower: -1, zeros: [], poles: [{ kind: 'real', omega: w2 }] };
			const cl = closedLoopDenominator(loop);
			const t = closedLoopTf({ gain: 1, originPower: 0, zeros: [], poles: [] }, cl, 'numerator');
			const pair = t.poles.find((p) => p.kind === 'pair');
			expect(pair?.kind).toBe('pair');
			if (pair?.kind === 'pair') expect(pair.q).toBeCloseTo(q, 4);
			expect(isStable(cl)).toBe(true);
		});
	}
});

describe('closed-loop output impedance against ngspice AC data', () => {
	// [ngspice: reference/ngspice/out/<case>.json, Zo and T from the averaged netlists; Zo,cl = Zo/(1 + T) formed here
	// by complex arithmetic on those outside numbers — formula sheet §8.1]
	for (const name of CASES) {
		it(`${name}: Zo/(1 + T) within 0.05 dB and 0.5° up to fsw/2`, () => {
			const det = detail(name);
			const ref = JSON.parse(readFileSync(join(ROOT, 'reference', 'ngspice', 'out', `${name}.json`), 'utf8'));
			const f: number[] = ref.freqHz;
			const half = det.document.plant.fsw / 2;
			const idx = f.map((_, i) => i).filter((i) => f[i] <= half && i % 5 === 0);
			const grid = idx.map((i) => f[i]);
			const cl = closedLoopOf(det);
			const r = closedLoopResponses(
				{ loop: det.loop, zo: det.plant.zo, gvg: det.plant.gvg, dividerRatio: det.document.feedback.vref / det.document.plant.vout },
				grid
			);
			expect(cl.stable).toBe(true);
			idx.forEach((i, k) => {
				const zo = polar(ref.responses.zo.magDb[i], ref.responses.zo.phaseDeg[i]);
				const t = polar(ref.responses.loop.magDb[i], ref.responses.loop.phaseDeg[i]);
				const z = div(zo, { re: 1 + t.re, im: t.im });
				const magDb = 20 * Math.log10(Math.hypot(z.re, z.im));
				const ph = Math.atan2(z.im, z.re) / deg;
				const got = r.outputImpedanceClosed;
				expect(Math.abs(got.magDb[k] - magDb), `${name} at ${grid[k]} Hz (index ${i})`).toBeLessThan(0.05);
				expect(Math.abs(wrap(got.phaseDeg[k] - ph)), `${name} phase at ${grid[k]} Hz`).toBeLessThan(0.5);
			});
		});
	}
});

describe('closed-loop poles against scipy', () => {
	// [scipy: eigenvalues of the closed-loop state matrix, reference/closedloop/out/<case>.json]
	for (const name of CASES) {
		it(`${name}: every pole below 1 GHz matches within 1e-4 relative`, () => {
			const det = detail(name);
			const cl = closedLoopOf(det);
			const ref: [number, number][] = closedRef(name).scipy.closedLoopPolesHz;
			const mine = cl.polesHz;
			// The delay case uses Padé(4,4) in scipy and the engine's chosen order: compare the poles slower than the delay.
			const delay = det.document.modulator.delay;
			const limit = delay > 0 ? 0.1 / (2 * Math.PI * delay) : 1e9;
			for (const [re, im] of ref) {
				const m = Math.hypot(re, im);
				if (m > limit) continue;
				const best = Math.min(...mine.map((p) => Math.hypot(p.re - re, p.im - im)));
				expect(best / m, `${name} pole ${re} ${im} Hz`).toBeLessThan(1e-4);
			}
		});
	}
});

describe('closed-loop responses', () => {
	it('a crossing of |T| = 1 keeps arg(1 + T) continuous on a coarse grid (several crossings)', () => {
		// Conditionally stable loop, three crossovers: sensitivity = 1/(1 + T) evaluated pointwise must match [hand-derived]
		const loop: FactoredTf = {
			gain: 2e4,
			originPower: -2,
			zeros: [
				{ kind: 'real', omega: 30 },
				{ kind: 'real', omega: 300 }
			],
			poles: [
				{ kind: 'real', omega: 3000 },
				{ kind: 'real', omega: 30000 }
			]
		};
		const grid = Array.from({ length: 30 }, (_, i) => 0.1 * Math.pow(10, i / 5));
		const r = closedLoopResponses({ loop, zo: { gain: 1, originPower: 0, zeros: [], poles: [] }, gvg: { gain: 1, originPower: 0, zeros: [], poles: [] }, dividerRatio: 1 }, grid);
		grid.forEach((f, k) => {
			const t = evaluate(loop, 2 * Math.PI * f);
			const s = div({ re: 1, im: 0 }, { re: 1 + t.re, im: t.im });
			expect(r.sensitivity.magDb[k]).toBeCloseTo(20 * Math.log10(Math.hypot(s.re, s.im)), 9);
			expect(wrap(r.sensitivity.phaseDeg[k] - Math.atan2(s.im, s.re) / deg)).toBeCloseTo(0, 7);
		});
		// Continuity: no 360° jumps between neighbours.
		for (let k = 1; k < grid.length; k++) expect(Math.abs(r.sensitivity.phaseDeg[k] - r.sensitivity.phaseDeg[k - 1])).toBeLessThan(90);
	});

	it('closed-loop Zo tends to 0 at DC with an integrator and to the open-loop Zo above crossover [common practice]', () => {
		const det = detail('buck-ceramic-1v2');
		const grid = [1, 10, 5e6];
		const r = closedLoopResponses({ loop: det.loop, zo: det.plant.zo, gvg: det.plant.gvg, dividerRatio: 0.5 }, grid);
		expect(r.outputImpedanceClosed.magDb[1] - r.outputImpedanceClosed.magDb[0]).toBeCloseTo(20, 0); // rises 20 dB/decade
		expect(Math.abs(r.outputImpedanceClosed.magDb[2] - r.outputImpedanceOpen.magDb[2])).toBeLessThan(0.5);
		// Reference to output → 1/H = 2 (6.02 dB) at low frequency [formula sheet §8.1]
		expect(r.referenceToOutput.magDb[0]).toBeCloseTo(20 * Math.log10(2), 4);
	});
});

const polar = (db: number, phDeg: number) => ({ re: 10 ** (db / 20) * Math.cos(phDeg * deg), im: 10 ** (db / 20) * Math.sin(phDeg * deg) });
function div(a: { re: number; im: number }, b: { re: number; im: number }) {
	const d = b.re * b.re + b.im * b.im;
	return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
const wrap = (x: number) => x - 360 * Math.round(x / 360);
