// K-factor placement against Venable's closed forms and the exactness property of the ideal design.
// [published: H. D. Venable, "The K Factor: A New Mathematical Tool for Stability Analysis and Synthesis",
// Proc. Powercon 10, 1983 — equations from memory, docs/formulas.md §6.1–§6.3]
import { describe, expect, it } from 'vitest';
import { boostForK, kFactorFor, requiredBoostDeg, resolveCompensator } from '../../../../src/lib/engine/compensators';
import { evaluatePolar } from '../../../../src/lib/engine/tf';
import { esrBuck, exampleBoost, exampleBuck, type TestPlant } from './fixtures';

const rel = (a: number, b: number) => Math.abs(a / b - 1);
const TWO_PI = 2 * Math.PI;

describe('K from the boost (§6.2)', () => {
	it('matches tan(B/2 + 45°) and tan²(B/4 + 45°) at hand-checked points', () => {
		// [published: Venable 1983, from memory] B = 60°: Type II K = tan 75° = 3.7321; Type III K = tan² 60° = 3
		expect(kFactorFor('type2', 60)).toBeCloseTo(3.7320508, 6);
		expect(kFactorFor('type3', 60)).toBeCloseTo(3, 12);
		expect(kFactorFor('type3', 120)).toBeCloseTo(Math.tan((75 * Math.PI) / 180) ** 2, 12);
		expect(kFactorFor('type1', 40)).toBe(1);
	});

	it('the boost delivered by K is the boost asked for', () => {
		// [published: Venable 1983] Type II 2·atan K − 90°, Type III 4·atan √K − 180°
		for (const b of [5, 30, 60, 85]) expect(boostForK('type2', kFactorFor('type2', b))).toBeCloseTo(b, 10);
		for (const b of [5, 60, 120, 170]) expect(boostForK('type3', kFactorFor('type3', b))).toBeCloseTo(b, 10);
	});
});

function plantAt(p: TestPlant, f: number) {
	const { magDb, phaseDeg } = evaluatePolar(p.plant, TWO_PI * f);
	return { g: 10 ** (-magDb / 20), phaseDeg };
}

describe.each([
	['buck', exampleBuck, 40e3, 55],
	['boost', exampleBoost, 40e3, 55],
	['buck at fs/20', exampleBuck, 30e3, 60]
] as const)('K-factor on the %s', (_name, make, fcHz, pm) => {
	const p = make();
	const ctx = { ...p, r1: 10e3 };
	const { g, phaseDeg } = plantAt(p, fcHz);
	const boost = pm - phaseDeg - 90;

	it('Type III parts equal Venable’s closed forms', () => {
		// [published: Venable 1983, Type 3 component equations, from memory (docs/formulas.md §6.3)]
		const r = resolveCompensator({ kind: 'type3', target: { method: 'k-factor', crossoverHz: fcHz, phaseMarginDeg: pm }, series: null }, ctx);
		const k = Math.tan(((boost / 4 + 45) * Math.PI) / 180) ** 2;
		const r1 = 10e3;
		const c2 = 1 / (TWO_PI * fcHz * g * r1);
		const c1 = c2 * (k - 1);
		const r2 = Math.sqrt(k) / (TWO_PI * fcHz * c1);
		const r3 = r1 / (k - 1);
		const c3 = 1 / (TWO_PI * fcHz * Math.sqrt(k) * r3);
		const parts = r.ideal.parts;
		for (const [name, v] of Object.entries({ c1, c2, r2, r3, c3 })) expect(rel(parts[name], v), name).toBeLessThan(1e-12);
		expect(r.placement.k).toBeCloseTo(k, 10);
	});

	it('the ideal Type III design crosses at fc with PM exactly the target', () => {
		// [published: Venable 1983 — symmetric placement gives the target PM at fc; §6.2 exactness]
		const pmK = pm;
		const r = resolveCompensator({ kind: 'type3', target: { method: 'k-factor', crossoverHz: fcHz, phaseMarginDeg: pmK }, series: null }, ctx);
		expect(r.achieved.ideal.crossovers.length).toBe(1);
		expect(rel(r.achieved.ideal.crossoverHz!, fcHz)).toBeLessThan(1e-7);
		expect(r.achieved.ideal.phaseMarginDeg!).toBeCloseTo(pmK, 5);
		expect(r.rounded).toBeNull();
	});
});

describe.each([
	['esr buck, 40 kHz, 55°', 40e3, 55],
	['esr buck, 25 kHz, 50°', 25e3, 50]
] as const)('K-factor Type II on the %s', (_name, fcHz, pm) => {
	const p = esrBuck();
	const ctx = { ...p, r1: 10e3 };
	const { g, phaseDeg } = plantAt(p, fcHz);
	const boost = pm - phaseDeg - 90;

	it('needs a boost a Type II can give', () => {
		expect(boost).toBeGreaterThan(5);
		expect(boost).toBeLessThan(85);
	});

	it('Type II parts equal Venable’s closed forms', () => {
		// [published: Venable 1983, Type 2 component equations, from memory (docs/formulas.md §6.3)]
		const r = resolveCompensator({ kind: 'type2', target: { method: 'k-factor', crossoverHz: fcHz, phaseMarginDeg: pm }, series: null }, ctx);
		const k = Math.tan(((boost / 2 + 45) * Math.PI) / 180);
		const c2 = 1 / (TWO_PI * fcHz * g * k * 10e3);
		const c1 = c2 * (k * k - 1);
		const r2 = k / (TWO_PI * fcHz * c1);
		for (const [name, v] of Object.entries({ c1, c2, r2 })) expect(rel(r.ideal.parts[name], v), name).toBeLessThan(1e-12);
	});

	it('the OTA version follows §5.5: Csum = H·gm·K/(2π·fc·G)', () => {
		// [published: transconductance amplifier K-factor inverse, docs/formulas.md §5.5 — from memory]
		const gm = 300e-6;
		const r = resolveCompensator({ kind: 'type2-ota', parts: { gm }, target: { method: 'k-factor', crossoverHz: fcHz, phaseMarginDeg: pm }, series: null }, ctx);
		const k = Math.tan(((boost / 2 + 45) * Math.PI) / 180);
		const h = p.vref / p.vout;
		const csum = (h * gm * k) / (TWO_PI * fcHz * g);
		const c2 = csum / (k * k);
		expect(rel(r.ideal.parts.c2, c2)).toBeLessThan(1e-12);
		expect(rel(r.ideal.parts.c1, csum - c2)).toBeLessThan(1e-12);
		expect(rel(r.ideal.parts.r2, k / (TWO_PI * fcHz * (csum - c2)))).toBeLessThan(1e-12);
	});

	it.each(['type2', 'type2-ota'] as const)('the ideal %s design crosses at fc with PM exactly the target', (kind) => {
		// [published: Venable 1983 — §6.2 exactness]
		const r = resolveCompensator(
			{ kind, parts: kind === 'type2-ota' ? { gm: 300e-6 } : undefined, target: { method: 'k-factor', crossoverHz: fcHz, phaseMarginDeg: pm }, series: null },
			ctx
		);
		expect(r.achieved.ideal.crossovers.length).toBe(1);
		expect(rel(r.achieved.ideal.crossoverHz!, fcHz)).toBeLessThan(1e-7);
		expect(r.achieved.ideal.phaseMarginDeg!).toBeCloseTo(pm, 5);
	});
});

describe('Type I and limits', () => {
	it('Type I gives PM = 90° + ∠P(fc) (§5.1)', () => {
		// [published: Venable 1983 Type 1; integrator adds −90° only]
		const p = exampleBuck();
		const r = resolveCompensator({ kind: 'type1', target: { method: 'k-factor', crossoverHz: 2e3, phaseMarginDeg: 80 }, series: null }, { ...p, r1: 10e3 });
		const { phaseDeg } = plantAt(p, 2e3);
		expect(rel(r.achieved.ideal.crossoverHz!, 2e3)).toBeLessThan(1e-7);
		expect(r.achieved.ideal.phaseMarginDeg!).toBeCloseTo(90 + phaseDeg, 5);
		// C1 = 1/(2π·fc·G·R1)
		expect(rel(r.ideal.parts.c1, 1 / (TWO_PI * 2e3 * plantAt(p, 2e3).g * 10e3))).toBeLessThan(1e-12);
	});

	it('a boost beyond Type II says so and points to Type III or a lower crossover', () => {
		// [published: Venable 1983 — Type II boost < 90°]
		const p = exampleBuck();
		expect(requiredBoostDeg(p.plant, 40e3, 55)).toBeGreaterThan(90);
		const r = resolveCompensator({ kind: 'type2', target: { method: 'k-factor', crossoverHz: 40e3, phaseMarginDeg: 55 } }, { ...p, r1: 10e3 });
		const w = r.warnings.find((x) => x.code === 'boost-exceeds-type');
		expect(w?.message).toMatch(/needs 12\d(\.\d)?° of phase boost; a Type II gives less than 90(\.0)?°/);
		expect(w?.message).toMatch(/use a Type III/);
		expect(w?.message).toMatch(/lower the crossover to about [\d.]+ kHz/);
		expect(r.warnings.map((x) => x.code)).toContain('pm-below-target');
		expect(r.achieved.ideal.phaseMarginDeg!).toBeLessThan(55);
	});

	it('a boost of 180° or more is reported as out of reach for every type', () => {
		// [published: Venable 1983 — Type III boost < 180°] the boost plant at 150 kHz lags far past −270°
		const p = exampleBoost();
		expect(requiredBoostDeg(p.plant, 150e3, 70)).toBeGreaterThan(180);
		const r = resolveCompensator({ kind: 'type3', target: { method: 'k-factor', crossoverHz: 150e3, phaseMarginDeg: 70 } }, { ...p, r1: 10e3 });
		expect(r.warnings.map((x) => x.code)).toEqual(expect.arrayContaining(['boost-infeasible', 'crossover-above-fsw-fifth', 'crossover-above-rhp-limit']));
	});
});
