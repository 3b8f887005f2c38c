// resolveCompensator end to end: the issue-4 request ("Type III, fc 40 kHz, PM 55°, E96/E12" on a buck and a boost),
// feature and manual placement, parts-win rule, finite op-amp, plain-words infeasibility, and field-named errors.
import { describe, expect, it } from 'vitest';
import { CompensatorDesignError, resolveCompensator, type CompensatorDoc } from '../../../../src/lib/engine/compensators';
import { compensatorTf } from '../../../../src/lib/engine/compensators/transfer';
import { isInSeries } from '../../../../src/lib/engine/synthesis/eSeries';
import { shapeFromParts, type NetworkParts } from '../../../../src/lib/engine/synthesis/networks';
import { evaluatePolar, multiply } from '../../../../src/lib/engine/tf';
import { esrBuck, exampleBoost, exampleBuck } from './fixtures';

const rel = (a: number, b: number) => Math.abs(a / b - 1);
const TWO_PI = 2 * Math.PI;
const codes = (r: { warnings: { code: string }[] }) => r.warnings.map((w) => w.code);

describe.each([
	['buck', exampleBuck],
	['boost', exampleBoost]
] as const)('Type III, fc 40 kHz, PM 55°, E96/E12 on the %s', (_name, make) => {
	const p = make();
	const doc: CompensatorDoc = {
		kind: 'type3',
		target: { method: 'k-factor', crossoverHz: 40e3, phaseMarginDeg: 55 },
		series: { resistors: 'E96', capacitors: 'E12' }
	};
	const r = resolveCompensator(doc, { ...p, r1: 10e3 });

	it('the ideal network meets the target exactly', () => {
		// [published: Venable 1983 exactness, §6.2]
		expect(rel(r.achieved.ideal.crossoverHz!, 40e3)).toBeLessThan(1e-7);
		expect(r.achieved.ideal.phaseMarginDeg!).toBeCloseTo(55, 5);
	});

	it('rounded parts are series values, R1 is kept, and their corners are recomputed', () => {
		// [common practice: R1 kept, resistors E96, capacitors E12; published: IEC 60063 lists]
		const rounded = r.rounded!;
		expect(rounded.parts.r1).toBe(10e3);
		for (const name of ['r2', 'r3', 'rb']) expect(isInSeries(rounded.parts[name], 'E96'), name).toBe(true);
		for (const name of ['c1', 'c2', 'c3']) expect(isInSeries(rounded.parts[name], 'E12'), name).toBe(true);
		const s = shapeFromParts({ kind: 'type3', ...rounded.parts } as unknown as NetworkParts);
		if (s.kind !== 'type3') throw new Error('kind');
		expect(rounded.zerosHz.map((f) => +f.toPrecision(9))).toEqual([s.zero1Hz, s.zero2Hz].sort((a, b) => a - b).map((f) => +f.toPrecision(9)));
		expect(rounded.polesHz[0]).toBe(0);
	});

	it('the achieved rounded margins are those of the built loop, and they differ from the ideal', () => {
		// [derived: |T(j2πfc)| = 1 at the reported crossover, ∠T there = PM − 180°]
		const a = r.achieved.rounded!;
		const t = evaluatePolar(multiply(r.built, p.plant), TWO_PI * a.crossoverHz!);
		expect(Math.abs(t.magDb)).toBeLessThan(1e-6);
		expect(180 + t.phaseDeg).toBeCloseTo(a.phaseMarginDeg!, 4);
		expect(Math.abs(a.crossoverHz! / 40e3 - 1)).toBeGreaterThan(1e-4); // rounding really moved it
	});
});

describe('features placement (§6.4)', () => {
	it('Type III on the ceramic buck: double zero at f0, both poles at fsw/2 (ESR zero above fsw/2), |T(fc)| = 1', () => {
		// [common practice: §6.4 VM buck Type III]
		const p = exampleBuck();
		const r = resolveCompensator({ kind: 'type3', target: { method: 'features', crossoverHz: 50e3, phaseMarginDeg: 45 }, series: null }, { ...p, r1: 10e3 });
		expect(r.ideal.zerosHz.every((z) => rel(z, p.features.f0Hz) < 1e-9)).toBe(true);
		expect(r.ideal.polesHz[0]).toBe(0);
		expect(rel(r.ideal.polesHz[1], 300e3)).toBeLessThan(1e-9);
		expect(rel(r.ideal.polesHz[2], 300e3)).toBeLessThan(1e-9);
		expect(rel(r.achieved.ideal.crossoverHz!, 50e3)).toBeLessThan(1e-7);
		expect(codes(r)).toContain('esr-pole-moved');
	});

	it('Type II on the ESR buck puts the pole at the ESR zero and honours user fractions', () => {
		// [common practice: §6.4 VM buck Type II, fz ≈ f0, fp ≈ fesr]
		const p = esrBuck();
		const r = resolveCompensator({ kind: 'type2', target: { method: 'features', crossoverHz: 40e3 }, series: null }, { ...p, r1: 10e3 });
		expect(rel(r.ideal.polesHz[1], p.features.esrZeroHz[0])).toBeLessThan(1e-9);
		const u = resolveCompensator(
			{ kind: 'type2', target: { method: 'features', crossoverHz: 40e3, zerosRelF0: [0.5], polesRelFsw: [0.4] }, series: null },
			{ ...p, r1: 10e3 }
		);
		expect(rel(u.ideal.zerosHz[0], 0.5 * p.features.f0Hz)).toBeLessThan(1e-9);
		expect(rel(u.ideal.polesHz[1], 200e3)).toBeLessThan(1e-9);
		expect(rel(u.achieved.ideal.crossoverHz!, 40e3)).toBeLessThan(1e-7);
	});
});

describe('manual placement', () => {
	const p = exampleBuck();
	it('a mid-band gain sets ωI/ωz, which |Gc| equals at √(fz·fp)', () => {
		// [derived by hand: |Gc(j√(ωzωp))| = ωI/ωz exactly for (ωI/s)(1 + s/ωz)/(1 + s/ωp)]
		const r = resolveCompensator(
			{ kind: 'type2', target: { method: 'manual', zerosHz: [1e3], polesHz: [100e3], midbandGainDb: 20 }, series: null },
			{ ...p, r1: 10e3 }
		);
		expect(evaluatePolar(r.built, TWO_PI * 10e3).magDb).toBeCloseTo(20, 10);
		// with C2 ≪ C1 the mid-band gain is ≈ R2/R1 (§5.2)
		expect(rel(r.ideal.parts.r2 / 10e3, 10)).toBeLessThan(0.011);
	});

	it('a crossover sets |T(fc)| = 1 with the user’s corners (Type III pairs sorted)', () => {
		const r = resolveCompensator(
			{ kind: 'type3', target: { method: 'manual', zerosHz: [14e3, 7e3], polesHz: [300e3, 150e3], crossoverHz: 45e3 }, series: null },
			{ ...p, r1: 10e3 }
		);
		expect(rel(r.achieved.ideal.crossoverHz!, 45e3)).toBeLessThan(1e-7);
		expect(r.ideal.zerosHz.map((f) => Math.round(f))).toEqual([7000, 14000]);
		expect(r.ideal.polesHz.map((f) => Math.round(f))).toEqual([0, 150000, 300000]);
	});

	it('an unbuildable pair is an error that names the field and says what to change', () => {
		// [common practice] a zero above its pole needs a negative C1
		const run = () =>
			resolveCompensator(
				{ kind: 'type2', target: { method: 'manual', zerosHz: [50e3], polesHz: [5e3], crossoverHz: 20e3 } },
				{ ...p, r1: 10e3 }
			);
		expect(run).toThrow(CompensatorDesignError);
		expect(run).toThrow(/zero \(50 kHz\) must lie below the pole \(5 kHz\)/);
	});

	it('a Type III with zeros far above the resonance is flagged conditionally stable', () => {
		// [common practice: phase below −180° while |T| > 1; verified by the engine's closed-loop poles]
		const r = resolveCompensator(
			{ kind: 'type3', target: { method: 'manual', zerosHz: [40e3, 40e3], polesHz: [300e3, 300e3], crossoverHz: 100e3 }, series: null },
			{ ...p, r1: 10e3 }
		);
		expect(codes(r)).toContain('conditionally-stable');
		expect(r.warnings.find((w) => w.code === 'conditionally-stable')!.message).toMatch(/crosses −180° at [\d.]+ kHz while the gain is still above 1/);
	});
});

describe('parts, series and the op-amp', () => {
	const p = exampleBuck();
	const ctx = { ...p, r1: 10e3 };

	it('parts win over a target, which is then only the goal', () => {
		// The design document's example network [spec/design-document.md]
		const doc: CompensatorDoc = {
			kind: 'type3',
			parts: { r2: 2000, r3: 150, c1: 6.8e-9, c2: 220e-12, c3: 2.2e-9 },
			target: { method: 'k-factor', crossoverHz: 60e3, phaseMarginDeg: 55 },
			series: { resistors: 'E96', capacitors: 'E12' }
		};
		const r = resolveCompensator(doc, ctx);
		expect(r.placement.method).toBe('parts');
		expect(r.rounded).toBeNull();
		expect(r.ideal.parts).toEqual({ r1: 10e3, rb: 10e3, r2: 2000, r3: 150, c1: 6.8e-9, c2: 220e-12, c3: 2.2e-9 });
		const direct = compensatorTf({ kind: 'type3', ...r.ideal.parts } as unknown as NetworkParts);
		expect(evaluatePolar(r.built, TWO_PI * 1e4).magDb).toBeCloseTo(evaluatePolar(direct, TWO_PI * 1e4).magDb, 12);
		expect(codes(r)).toContain('resistor-out-of-range'); // R3 = 150 Ω
	});

	it('series absent means E96/E12; null means no rounding', () => {
		const target = { method: 'k-factor', crossoverHz: 40e3, phaseMarginDeg: 55 } as const;
		const d = resolveCompensator({ kind: 'type3', target }, ctx);
		expect(isInSeries(d.rounded!.parts.r2, 'E96') && isInSeries(d.rounded!.parts.c1, 'E12')).toBe(true);
		expect(resolveCompensator({ kind: 'type3', target, series: null }, ctx).rounded).toBeNull();
		const capsOnly = resolveCompensator({ kind: 'type3', target, series: { resistors: null, capacitors: 'E6' } }, ctx).rounded!;
		expect(capsOnly.parts.r2).toBe(d.ideal.parts.r2);
		expect(isInSeries(capsOnly.parts.c2, 'E6')).toBe(true);
	});

	it('a slow op-amp is flagged and placement compensates for it (refine.ts); a fast one is not flagged', () => {
		// [common practice: |A| ≥ 10·NG from fc to the top pole, §5.6]
		const target = { method: 'k-factor', crossoverHz: 40e3, phaseMarginDeg: 55 } as const;
		const slow = resolveCompensator({ kind: 'type3', target, series: null, opamp: { a0Db: 80, gbw: 3e6 } }, ctx);
		const fast = resolveCompensator({ kind: 'type3', target, series: null, opamp: { a0Db: 120, gbw: 200e6 } }, ctx);
		expect(codes(slow)).toContain('opamp-gbw-too-low');
		expect(codes(fast)).not.toContain('opamp-gbw-too-low');
		// placement re-places on the built loop with the op-amp model, so both meet the request (DEVELOPERS.md, "Verdict rules")
		expect(Math.abs(slow.achieved.ideal.phaseMarginDeg! - 55)).toBeLessThan(0.2);
		expect(Math.abs(fast.achieved.ideal.phaseMarginDeg! - 55)).toBeLessThan(0.2);
	});
});

describe('targets out of reach say why', () => {
	it('crossover above fsw/5, near the resonance, above a fifth of the RHP zero', () => {
		// [common practice: §7.2 targets, §6.4]
		const buck = exampleBuck();
		const high = resolveCompensator({ kind: 'type3', target: { method: 'k-factor', crossoverHz: 150e3, phaseMarginDeg: 45 } }, { ...buck, r1: 10e3 });
		expect(codes(high)).toContain('crossover-above-fsw-fifth');
		expect(codes(high)).toContain('pole-above-half-fsw');
		const near = resolveCompensator({ kind: 'type3', target: { method: 'k-factor', crossoverHz: buck.features.f0Hz * 1.2, phaseMarginDeg: 45 } }, { ...buck, r1: 10e3 });
		expect(codes(near)).toContain('crossover-near-resonance');
		const boost = exampleBoost();
		const rhp = resolveCompensator({ kind: 'type3', target: { method: 'k-factor', crossoverHz: 90e3, phaseMarginDeg: 45 } }, { ...boost, r1: 10e3 });
		// One rule, one number: above a fifth of the RHP zero, and the advice names that same fifth
		const w = rhp.warnings.find((x) => x.code === 'crossover-above-rhp-limit')!;
		expect(w.message).toMatch(/above a fifth of the RHP zero \(241 kHz\).*Keep fc at or below 48\.2 kHz/);
		expect(w.message).not.toMatch(/third/);
	});
});

describe('bad input names the field', () => {
	const ctx = { ...exampleBuck(), r1: 10e3 };
	const fieldOf = (doc: unknown) => {
		try {
			resolveCompensator(doc as CompensatorDoc, ctx);
		} catch (e) {
			if (e instanceof CompensatorDesignError) return { field: e.field, message: e.message, fields: e.fields };
			throw e;
		}
		return null;
	};

	it.each([
		[{ kind: 'type3', target: { method: 'k-factor', phaseMarginDeg: 50 } }, 'compensator.target.crossoverHz', /is required for k-factor/],
		[{ kind: 'type3', parts: { r2: 1e3, c1: 1e-9, c2: 1e-10, c3: 1e-9 } }, 'compensator.parts.r3', /is required for type3/],
		[{ kind: 'type2', parts: { r2: -5, c1: 1e-9, c2: 1e-10 } }, 'compensator.parts.r2', /must be > 0/],
		[{ kind: 'type4', parts: {} }, 'compensator.kind', /must be one of/],
		[{ kind: 'type2', target: { method: 'manual', zerosHz: [1e3], polesHz: [] , crossoverHz: 1e4 } }, 'compensator.target.polesHz', /must list 1/],
		[{ kind: 'type2-ota', target: { method: 'k-factor', crossoverHz: 1e4, phaseMarginDeg: 50 } }, 'compensator.parts.gm', /is required/],
		[{ kind: 'type2', series: { resistors: 'E100', capacitors: null }, parts: { r2: 1e3, c1: 1e-9, c2: 1e-10 } }, 'compensator.series.resistors', /E3, E6/],
		[{ kind: 'type3', target: { method: 'k-factor', crossoverHz: 4e4, phaseMarginDeg: 200 } }, 'compensator.target.phaseMarginDeg', /< 180°/]
	])('%j → %s', (doc, field, message) => {
		const err = fieldOf(doc);
		expect(err?.field).toBe(field);
		expect(err?.message).toMatch(message);
	});

	it('rejects a context with Vref above Vout', () => {
		expect(() => resolveCompensator({ kind: 'type1', parts: { c1: 1e-9 } }, { ...ctx, vref: 2 })).toThrow(/feedback.vref must not exceed/);
	});
});
