// Network parts ↔ corner frequencies. Exact forward forms and inverses of the docs/formulas.md §5.2/§5.3/§5.5
// [published: standard inverting-amplifier algebra, Zf/Zi; Venable 1983 network layout — from memory], the
// divider of §3, and round trips parts → corners → parts to 1e-9 relative.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	bottomResistor,
	dividerVout,
	midbandGain,
	pairType3,
	partsFromShape,
	shapeFromParts,
	shapeGainAt,
	shapeProblem,
	topResistorFromCurrent,
	withGainAt,
	type NetworkParts
} from '../../../../src/lib/engine/synthesis/networks';

const rel = (a: number, b: number) => Math.abs(a / b - 1);
const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log(lo), max: Math.log(hi), noNaN: true }).map(Math.exp);

function maxRelDiff(a: NetworkParts, b: NetworkParts): number {
	let worst = 0;
	for (const [k, v] of Object.entries(a)) {
		const w = (b as unknown as Record<string, unknown>)[k];
		if (typeof v === 'number' && typeof w === 'number') worst = Math.max(worst, rel(w, v));
	}
	return worst;
}

describe('divider (§3)', () => {
	it('sets Rb from Vref and R1 from a divider current', () => {
		// [common practice] Vout = Vref·(1 + R1/Rb): 1.2 V from 0.6 V needs Rb = R1; 3.3 V from 0.8 V with 10 kΩ → 3.2 kΩ
		expect(bottomResistor(10e3, 1.2, 0.6)).toBe(10e3);
		expect(bottomResistor(10e3, 3.3, 0.8)).toBeCloseTo(3200, 9);
		expect(bottomResistor(10e3, 0.6, 0.6)).toBeNull();
		// 100 µA through the divider: R1 = (1.2 − 0.6)/100 µA = 6 kΩ
		expect(topResistorFromCurrent(1.2, 0.6, 100e-6)).toBeCloseTo(6000, 9);
		expect(dividerVout({ r1: 10e3, rb: 3.2e3 }, 0.8)).toBeCloseTo(3.3, 12);
		expect(() => bottomResistor(10e3, 0.5, 0.6)).toThrow(/vref ≤ vout/);
	});
});

describe('forward forms (§5.1–§5.3, §5.5)', () => {
	it('Type I integrator crosses unity at 1/(2π·R1·C1)', () => {
		// [published: inverting integrator, Gc = 1/(sR1C1)] 10 kΩ, 10 nF → 1591.55 Hz
		const s = shapeFromParts({ kind: 'type1', r1: 10e3, rb: 10e3, c1: 10e-9 });
		expect(s.integratorHz).toBeCloseTo(1 / (2 * Math.PI * 1e-4), 9);
	});

	it('Type II zero 1/(2πR2C1), pole ≈ 1/(2πR2C2) and mid-band ≈ R2/R1 when C2 ≪ C1', () => {
		// [published: Type II network, §5.2 — the approximations are textbook forms]
		const p = { kind: 'type2', r1: 10e3, rb: 10e3, r2: 47e3, c1: 10e-9, c2: 10e-12 } as const;
		const s = shapeFromParts(p);
		if (s.kind !== 'type2') throw new Error('kind');
		expect(s.zeroHz).toBeCloseTo(1 / (2 * Math.PI * 47e3 * 10e-9), 9);
		expect(rel(s.poleHz, 1 / (2 * Math.PI * 47e3 * 10e-12))).toBeLessThan(1.1e-3);
		expect(rel(midbandGain(s)!, 4.7)).toBeLessThan(1.1e-3);
	});

	it('Type III input branch: zero 1/(2π(R1+R3)C3), pole 1/(2πR3C3); high plateau ≈ R2/R3', () => {
		// [published: Type III network, §5.3]
		const p = { kind: 'type3', r1: 10e3, rb: 10e3, r2: 20e3, r3: 100, c1: 10e-9, c2: 10e-12, c3: 1e-9 } as const;
		const s = shapeFromParts(p);
		if (s.kind !== 'type3') throw new Error('kind');
		expect(s.zero2Hz).toBeCloseTo(1 / (2 * Math.PI * 10.1e3 * 1e-9), 6);
		expect(s.pole2Hz).toBeCloseTo(1 / (2 * Math.PI * 100 * 1e-9), 6);
		// A network with a wide plateau: fp2 = 15.9 kHz, fp1 ≈ 1.59 MHz.
		const q = { kind: 'type3', r1: 10e3, rb: 10e3, r2: 10e3, r3: 1e3, c1: 100e-9, c2: 10e-12, c3: 10e-9 } as const;
		// plateau R2·(R1+R3)/(R1·R3) = 11 between max(fz1, fp2) = 15.9 kHz and fp1 = 1.59 MHz; check at 150 kHz
		expect(rel(shapeGainAt(shapeFromParts(q), 150e3), 11)).toBeLessThan(0.02);
	});

	it('OTA Type II: ωI = H·gm/(C1 + C2), mid-band ≈ H·gm·R2 (§5.5)', () => {
		// [published: transconductance error amplifier, Gc = H·gm·Zc]
		const s = shapeFromParts({ kind: 'type2-ota', r1: 10e3, rb: 10e3, gm: 1e-3, r2: 10e3, c1: 10e-9, c2: 10e-12 });
		expect(rel(s.integratorHz, (0.5 * 1e-3) / (10.01e-9 * 2 * Math.PI))).toBeLessThan(1e-12);
		expect(rel(midbandGain(s)!, 5)).toBeLessThan(1.1e-3);
	});
});

describe('round trip parts → corners → parts (exact inverse, 1e-9 relative)', () => {
	const r = () => logUniform(1e2, 1e6);
	const c = () => logUniform(1e-12, 1e-5);
	const rb = fc.option(logUniform(1e2, 1e6), { nil: null });
	// Each zero sits at least 2× below its pole (C2 ≤ C1, R3 ≤ R1). Closer pairs are ill-conditioned in corner form:
	// fp/fz = 1 + C1/C2 keeps only ~16 − log10(C2/C1) digits of C1, whatever formula inverts it.
	const below = () => logUniform(1e-6, 1);

	it('Type I', () => {
		fc.assert(
			fc.property(r(), rb, c(), (r1, rbv, c1) => {
				const p: NetworkParts = { kind: 'type1', r1, rb: rbv, c1 };
				return maxRelDiff(p, partsFromShape(shapeFromParts(p), p)) < 1e-9;
			}),
			{ numRuns: 200 }
		);
	});

	it('Type II', () => {
		fc.assert(
			fc.property(r(), rb, r(), c(), below(), (r1, rbv, r2, c1, k2) => {
				const p: NetworkParts = { kind: 'type2', r1, rb: rbv, r2, c1, c2: c1 * k2 };
				return maxRelDiff(p, partsFromShape(shapeFromParts(p), p)) < 1e-9;
			}),
			{ numRuns: 200 }
		);
	});

	it('Type III', () => {
		fc.assert(
			fc.property(r(), rb, r(), below(), c(), below(), c(), (r1, rbv, r2, k3, c1, k2, c3) => {
				const p: NetworkParts = { kind: 'type3', r1, rb: rbv, r2, r3: r1 * k3, c1, c2: c1 * k2, c3 };
				return maxRelDiff(p, partsFromShape(shapeFromParts(p), p)) < 1e-9;
			}),
			{ numRuns: 200 }
		);
	});

	it('Type II OTA', () => {
		fc.assert(
			fc.property(r(), rb, logUniform(1e-5, 1e-2), r(), c(), below(), (r1, rbv, gm, r2, c1, k2) => {
				const p: NetworkParts = { kind: 'type2-ota', r1, rb: rbv, gm, r2, c1, c2: c1 * k2 };
				return maxRelDiff(p, partsFromShape(shapeFromParts(p), p)) < 1e-9;
			}),
			{ numRuns: 200 }
		);
	});

	it('corners → parts → corners as well (Type III)', () => {
		const shape = { kind: 'type3', integratorHz: 850, zero1Hz: 6e3, pole1Hz: 150e3, zero2Hz: 12e3, pole2Hz: 300e3 } as const;
		const back = shapeFromParts(partsFromShape(shape, { r1: 10e3, rb: 10e3 }));
		for (const [k, v] of Object.entries(shape)) {
			if (typeof v === 'number') expect(rel((back as unknown as Record<string, number>)[k], v), k).toBeLessThan(1e-12);
		}
	});
});

describe('inverse with a gain at fc (§5.2 inverse)', () => {
	it('|Gc(j2πfc)| equals the requested gain exactly', () => {
		// [derived: ωI = G·2πfc/shape, §5.2]
		const shape = withGainAt({ kind: 'type2', integratorHz: 1, zeroHz: 2e3, poleHz: 200e3 }, 40e3, 7.3);
		expect(rel(shapeGainAt(shape, 40e3), 7.3)).toBeLessThan(1e-14);
	});

	it('refuses a zero above its pole, naming the corners', () => {
		// [common practice] C1 or R3 would have to be negative
		expect(shapeProblem({ kind: 'type2', integratorHz: 1, zeroHz: 5e3, poleHz: 2e3 })).toMatch(/zero .* below the pole/);
		expect(() =>
			partsFromShape({ kind: 'type3', integratorHz: 1, zero1Hz: 1e3, pole1Hz: 1e5, zero2Hz: 2e5, pole2Hz: 1e5 }, { r1: 1e4, rb: 1e4 })
		).toThrow(/input-branch zero/);
	});

	it('pairs free Type III corners in sorted order', () => {
		// [common practice] lower zero/pole to the feedback branch, as in fz1 = 0.5·f0, fp1 = fesr (§6.4)
		expect(pairType3([20e3, 5e3], [300e3, 90e3])).toEqual({ zero1Hz: 5e3, pole1Hz: 90e3, zero2Hz: 20e3, pole2Hz: 300e3 });
	});
});
