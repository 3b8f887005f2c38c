/**
 * Values far outside practical ranges warn (never refuse) naming the usual
 * range; one RHP-zero crossover rule for the advice and the verdict; no advice to simplify an
 * unstable loop; numbers in warnings in engineering notation with their unit.
 */
import fc from 'fast-check';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeDesign } from '$lib/engine/analyze';
import { RHP_ZERO_CROSSOVER_FRACTION, RHP_ZERO_RULE_CODE } from '$lib/engine/compensators/crossoverLimit';
import { IMPLAUSIBLE_CODE } from '$lib/engine/contract/plausibility';
import { verifyDesign } from '$lib/engine/verify';
import type { AnalysisResponse } from '$lib/engine/contract/responseSchema';
import type { Verification } from '$lib/engine/verify/types';
import { validDesign } from '../../property/designs';
import { propertyParams, propertyTimeout } from '../../property/runs';

const CASES = join(__dirname, '..', '..', '..', '..', 'reference', 'cases');
const load = (name: string) => JSON.parse(readFileSync(join(CASES, `${name}.json`), 'utf8'));
const analyse = (doc: unknown) => analyzeDesign(doc) as AnalysisResponse;

describe('plausibility: far outside the usual range warns, never refuses', () => {
	it('an inductor of 100 H is analysed with a warning naming the field, the value and the usual range', () => {
		// [common practice: switching-regulator power inductors span about 10 nH to 10 mH]
		const doc = load('buck-ceramic-1v2');
		doc.plant.inductor.l = 100;
		const r = analyzeDesign(doc);
		expect('error' in r).toBe(false);
		const w = (r as AnalysisResponse).warnings.filter((x) => x.code === IMPLAUSIBLE_CODE);
		expect(w.map((x) => x.message)).toEqual(['plant.inductor.l = 100 H is outside the usual 10 nH to 10 mH of power inductors; check the value and its unit.']);
	});
	it('names each implausible field once, per capacitor branch too', () => {
		const doc = load('buck-bank-3v3');
		doc.plant.fsw = 4000; // kHz lost a zero and a prefix [common practice: 10 kHz … 10 MHz]
		delete doc.sweep;
		doc.plant.capacitors[1].esl = 3e-6; // µH typed for nH [common practice: ESL up to about 20 nH per part]
		const msgs = analyse(doc).warnings.filter((x) => x.code === IMPLAUSIBLE_CODE).map((x) => x.message);
		expect(msgs).toHaveLength(2);
		expect(msgs[0]).toMatch(/^plant\.fsw = 4 kHz is outside the usual 10 kHz to 10 MHz/);
		expect(msgs[1]).toMatch(/^plant\.capacitors\.1\.esl = 3 µH is outside the usual up to 20 nH/);
	});
	it('no reference design (realistic values) gets a plausibility warning', () => {
		for (const f of readdirSync(CASES)) {
			const r = analyse(JSON.parse(readFileSync(join(CASES, f), 'utf8')));
			expect(r.warnings.filter((x) => x.code === IMPLAUSIBLE_CODE), f).toEqual([]);
		}
	});
});

describe('one RHP-zero crossover rule', () => {
	// boost-ceramic-5v-12v moved to a crossover above a fifth of its RHP zero
	const doc = load('boost-ceramic-5v-12v');
	const rhpHz = analyse(doc).features.rhpZeroHz!;
	const fcHz = 0.3 * rhpHz;
	const high = { ...doc, compensator: { kind: 'type3', target: { method: 'k-factor', crossoverHz: fcHz, phaseMarginDeg: 45 } } };

	it('the advice and its limit are the same fifth [common practice: fc ≤ fRHP/5]', () => {
		expect(RHP_ZERO_CROSSOVER_FRACTION).toBe(1 / 5);
		const w = analyse(high).warnings.filter((x) => x.code === RHP_ZERO_RULE_CODE);
		expect(w).toHaveLength(1);
		const limit = RHP_ZERO_CROSSOVER_FRACTION * rhpHz;
		expect(w[0].message).toContain('above a fifth of the RHP zero');
		expect(w[0].message).toContain(`Keep fc at or below ${(limit / 1e3).toPrecision(3)} kHz`);
		expect(analyse(high).warnings.map((x) => x.code)).not.toContain('crossover-above-rhp-third');
	});
	it('the verdict cautions on the fc row with the same words, naming the corner', () => {
		const v = verifyDesign(high) as Verification;
		const row = v.rows.find((r) => r.metric === 'fc')!;
		expect(row.status === 'caution' || row.status === 'fail').toBe(true);
		if (row.status === 'caution') expect(row.reason).toMatch(/^At Vin nom, Iout nom.*above a fifth of the RHP zero/);
		expect(v.warnings.find((x) => x.code === RHP_ZERO_RULE_CODE)?.corners).toContain('Vin nom, Iout nom');
	});
	it('a crossover well below the limit passes the rule', () => {
		const low = { ...doc, compensator: { kind: 'type3', target: { method: 'k-factor', crossoverHz: 0.1 * rhpHz, phaseMarginDeg: 45 } } };
		expect(analyse(low).warnings.map((x) => x.code)).not.toContain(RHP_ZERO_RULE_CODE);
		const v = verifyDesign(low) as Verification;
		expect(v.rows.find((r) => r.metric === 'fc')!.reason).not.toMatch(/RHP/);
	});
});

describe('no advice to simplify an unstable loop', () => {
	it('a high-Q LC far above fc: unstable, so no boost-not-needed', () => {
		// Undamped LC (no ESR, no DCR, 50 mA load): the resonant peak crosses 0 dB again with the
		// phase past −180° [published: E&M Ch. 9, resonant peaking of the loop gain]
		const l = 4.7e-6;
		const c = 100e-6;
		const f0 = 1 / (2 * Math.PI * Math.sqrt(l * c));
		const doc = {
			schemaVersion: 1,
			plant: { topology: 'buck', vin: 12, vout: 5, iout: 0.05, fsw: 300e3, inductor: { l, dcr: 0 }, capacitors: [{ c, esr: 0, esl: 0, count: 1 }], rdsOn: 0 },
			modulator: { vramp: 1, feedForward: false, delay: 0 },
			feedback: { vref: 0.8, r1: 10000 },
			compensator: { kind: 'type2', target: { method: 'k-factor', crossoverHz: 0.1 * f0, phaseMarginDeg: 45 } }
		};
		const r = analyse(doc);
		expect(r.metrics.closedLoopStable).toBe(false);
		const codes = r.warnings.map((w) => w.code);
		expect(codes).toContain('unstable');
		expect(codes).not.toContain('boost-not-needed');
	});
});

describe('numbers in warnings: engineering notation with the unit', () => {
	it('property: no warning of any valid design prints a long SI number (0.0000068 H, 419000 Hz)', () => {
		fc.assert(
			fc.property(validDesign, (doc) => {
				const r = analyzeDesign(doc);
				if ('error' in r) return;
				for (const w of r.warnings) {
					// Five or more digits in a row, or more than four after a decimal point.
					expect(w.message, w.code).not.toMatch(/\d{5,}|\.\d{5,}/);
				}
			}),
			propertyParams(80)
		);
	}, propertyTimeout());
});
