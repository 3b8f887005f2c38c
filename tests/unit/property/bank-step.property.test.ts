// Property: for any valid bank of one to eight branches, every branch with ESR
// and ESL, a stable loop has a finite load step and reference step, and the partial fractions
// the steps are built from reproduce the closed-loop output impedance Zo/(1 + T) at jω computed
// directly from the plant and loop factors (no closed-loop poles involved) [standard Laplace
// algebra: H(s) = D + Σ r_i/(s − p_i) for a proper H with simple poles].
// Before the residues were formed without overflow, six ESL branches already answered
// "non-finite output"; this property covers the whole schema range (at most 8 branches).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeDesignDetailed, type AnalysisDetail } from '$lib/engine/analyze';
import { analyzeClosedLoop } from '$lib/engine/closedloop/analyzeClosedLoop';
import { closedLoopDenominator, closedLoopTf, isStable } from '$lib/engine/closedloop/closedLoopTf';
import { closedLoopInputOf } from '$lib/engine/closedloop/sections';
import { modalForm } from '$lib/engine/timeresponse/modal';
import { evaluate } from '$lib/engine/tf/evaluate';
import { multiply } from '$lib/engine/tf/algebra';
import { propertyParams, propertyTimeout } from './runs';

const logUniform = (min: number, max: number) =>
	fc.double({ min: Math.log10(min), max: Math.log10(max), noNaN: true }).map((e) => 10 ** e);

/** Ceramic to bulk parts with the parasitics of their families [common practice ranges]. */
const eslBranch = fc.record({
	c: logUniform(1e-7, 1e-3),
	esr: logUniform(5e-4, 0.05),
	esl: logUniform(5e-11, 3e-9),
	count: fc.integer({ min: 1, max: 20 })
});

const design = fc
	.record({
		topology: fc.constantFrom('buck', 'boost'),
		vin: logUniform(3, 48),
		ratio: fc.double({ min: 0.1, max: 0.7, noNaN: true }),
		boostGain: fc.double({ min: 1.3, max: 3, noNaN: true }),
		iout: logUniform(0.5, 30),
		fsw: logUniform(2e5, 2e6),
		rippleRatio: fc.double({ min: 0.2, max: 0.6, noNaN: true }),
		capacitors: fc.array(eslBranch, { minLength: 1, maxLength: 8 }),
		kind: fc.constantFrom('type2', 'type3'),
		crossoverRel: fc.double({ min: 0.02, max: 0.12, noNaN: true })
	})
	.map((p) => {
		const vout = p.topology === 'buck' ? p.vin * p.ratio : p.vin * p.boostGain;
		const duty = p.topology === 'buck' ? vout / p.vin : 1 - p.vin / vout;
		// CCM ripple ΔiL = ripple·IL [published: E&M Ch. 2]
		const il = p.topology === 'buck' ? p.iout : p.iout / (1 - duty);
		const l = p.topology === 'buck' ? (vout * (1 - duty)) / (p.fsw * p.rippleRatio * il) : (p.vin * duty) / (p.fsw * p.rippleRatio * il);
		// A boost's crossover stays well below its RHP zero.
		const fc = p.crossoverRel * p.fsw * (p.topology === 'boost' ? 0.2 : 1);
		return {
			schemaVersion: 1,
			plant: { topology: p.topology, vin: p.vin, vout, iout: p.iout, fsw: p.fsw, inductor: { l, dcr: 0.002 }, capacitors: p.capacitors, rdsOn: 0.005 },
			modulator: { vramp: 1, feedForward: false, delay: 0 },
			feedback: { vref: Math.min(0.6, vout / 2), r1: 10000 },
			compensator: { kind: p.kind, target: { method: 'k-factor', crossoverHz: fc, phaseMarginDeg: 55 } }
		};
	});

describe('property: steps of banks up to eight ESL branches', () => {
	it(
		'are finite, and their partial fractions reproduce Zo/(1 + T)(jω)',
		() => {
			let checked = 0;
			fc.assert(
				fc.property(design, (doc) => {
					const det = analyzeDesignDetailed(doc);
					if ('error' in det) return; // operating point refused: not this property's subject
					const input = closedLoopInputOf(det as AnalysisDetail, det.response.response.freqHz);
					const loop = multiply(input.compensator, input.modulator, input.plant.gvd);
					const cl = closedLoopDenominator(loop);
					if (!isStable(cl)) return;
					checked++;
					const section = analyzeClosedLoop(input);
					expect(section.warnings.map((w) => w.message)).not.toContainEqual(expect.stringMatching(/No (load|reference) step/));
					for (const v of [...section.loadStep!.waveform.value, ...section.referenceStep!.waveform.value]) expect(Number.isFinite(v)).toBe(true);

					const zoCl = closedLoopTf(input.plant.zo, cl, 'denominator');
					const m = modalForm(zoCl);
					const fsw = doc.plant.fsw;
					const freqs = [fsw / 1000, fsw / 100, fsw / 20, fsw / 5, fsw / 2, 2 * fsw];
					const direct = freqs.map((f) => {
						const w = 2 * Math.PI * f;
						const z = evaluate(input.plant.zo, w);
						const t = evaluate(loop, w);
						const d = { re: 1 + t.re, im: t.im };
						const den = d.re * d.re + d.im * d.im;
						return { re: (z.re * d.re + z.im * d.im) / den, im: (z.im * d.re - z.re * d.im) / den };
					});
					const scaleMax = Math.max(...direct.map((h) => Math.hypot(h.re, h.im)));
					freqs.forEach((f, i) => {
						const w = 2 * Math.PI * f;
						let re = m.direct;
						let im = 0;
						m.poles.forEach((p, k) => {
							// r/(jω − p)
							const dr = -p.re;
							const di = w - p.im;
							const r = m.residues[k];
							const den = dr * dr + di * di;
							re += (r.re * dr + r.im * di) / den;
							im += (r.im * dr - r.re * di) / den;
						});
						expect(Math.hypot(re - direct[i].re, im - direct[i].im), `at ${f} Hz`).toBeLessThan(1e-6 * scaleMax);
					});
				}),
				propertyParams(60)
			);
			// Most generated loops are stable; the property must have looked at some.
			expect(checked).toBeGreaterThan(10);
		},
		propertyTimeout()
	);
});
