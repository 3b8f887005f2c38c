/**
 * The verdict rules (verify/rules.ts), one at a time. Thresholds [common practice]: up to 5° PM or
 * 3 dB GM short of the target = caution, more = fail; fc above maxCrossoverFraction·fsw = caution,
 * above fsw/2 (outside the averaged model) = fail; any corner unstable or not modelled = fail;
 * yield below 100 % = caution, below 90 % = fail; a model-invalidating warning = caution.
 */
import { describe, expect, it } from 'vitest';
import { targetsSchema } from '../../../../src/lib/engine/contract/targetsSchema';
import { verdictRulesOf as verdictOf } from '../../../../src/lib/engine/verify';
import type { VerifiedCorner } from '../../../../src/lib/engine/verify/types';

const targets = targetsSchema.parse({ phaseMarginDeg: 45, gainMarginDb: 10 });
const corner = (over: Partial<VerifiedCorner> = {}): VerifiedCorner => ({
	label: 'Vin nom, Iout nom', vin: 12, iout: 1, factors: {}, crossoverHz: 20e3, phaseMarginDeg: 60, gainMarginDb: 15, closedLoopStable: true, warnings: [], error: null, ...over
});
const w = (value: number, c = 'Vin max, Iout min') => ({ value, corner: c });
const input = (over: Partial<Parameters<typeof verdictOf>[0]> = {}) => ({
	targets,
	fswHz: 500e3,
	corners: [corner()],
	worst: { phaseMarginDeg: w(60), gainMarginDb: w(15), crossoverLowHz: w(18e3), crossoverHighHz: w(25e3) },
	spread: null,
	warnings: [],
	...over
});
const row = (v: ReturnType<typeof verdictOf>, m: string) => v.rows.find((r) => r.metric === m)!;

describe('verdict rules', () => {
	it('passes when every figure meets its target at every corner', () => {
		const v = verdictOf(input());
		expect(v.status).toBe('pass');
		expect(v.summary).toBe('Meets every target at all 1 corners.');
	});
	it('PM: up to 5° short is a caution, more is a fail, naming the corner', () => {
		expect(row(verdictOf(input({ worst: { ...input().worst, phaseMarginDeg: w(40.5) } })), 'pm').status).toBe('caution');
		const fail = verdictOf(input({ worst: { ...input().worst, phaseMarginDeg: w(39.9) } }));
		expect(row(fail, 'pm').status).toBe('fail');
		expect(fail.status).toBe('fail');
		expect(fail.summary).toContain('Vin max, Iout min');
	});
	it('GM: up to 3 dB short is a caution, more is a fail', () => {
		expect(row(verdictOf(input({ worst: { ...input().worst, gainMarginDb: w(7.5) } })), 'gm').status).toBe('caution');
		expect(row(verdictOf(input({ worst: { ...input().worst, gainMarginDb: w(6.9) } })), 'gm').status).toBe('fail');
	});
	it('fc: above maxCrossoverFraction·fsw is a caution, above fsw/2 a fail, outside the crossoverHz range a caution', () => {
		expect(row(verdictOf(input({ worst: { ...input().worst, crossoverHighHz: w(101e3) } })), 'fc').status).toBe('caution');
		expect(row(verdictOf(input({ worst: { ...input().worst, crossoverHighHz: w(251e3) } })), 'fc').status).toBe('fail');
		const ranged = { ...targets, crossoverHz: { min: 19e3 } };
		expect(row(verdictOf(input({ targets: ranged })), 'fc').status).toBe('caution');
	});
	it('no crossover at a corner, an unstable corner or a corner that cannot be modelled is a fail', () => {
		expect(row(verdictOf(input({ corners: [corner(), corner({ label: 'Vin min, Iout min', phaseMarginDeg: null, crossoverHz: null })] })), 'pm').status).toBe('fail');
		expect(row(verdictOf(input({ corners: [corner({ closedLoopStable: false })] })), 'stability').status).toBe('fail');
		expect(row(verdictOf(input({ corners: [corner({ error: 'duty above 0.95', phaseMarginDeg: null, closedLoopStable: null })] })), 'stability').status).toBe('fail');
	});
	it('spread yield: 100 % passes, 90 % … 100 % is a caution, below 90 % a fail', () => {
		expect(row(verdictOf(input({ spread: { yield: 1, samples: 100 } })), 'yield').status).toBe('pass');
		expect(row(verdictOf(input({ spread: { yield: 0.95, samples: 100 } })), 'yield').status).toBe('caution');
		expect(row(verdictOf(input({ spread: { yield: 0.89, samples: 100 } })), 'yield').status).toBe('fail');
		expect(verdictOf(input()).rows.map((r) => r.metric)).not.toContain('yield');
	});
	it('a warning that invalidates the averaged model at a corner is a caution naming that corner; others are not', () => {
		const dcm = verdictOf(input({ warnings: [{ code: 'dcm-operating-point', message: 'DCM.', corners: ['Vin max, Iout min'] }] }));
		expect(row(dcm, 'model').status).toBe('caution');
		expect(row(dcm, 'model').corner).toBe('Vin max, Iout min');
		expect(dcm.status).toBe('caution');
		const other = verdictOf(input({ warnings: [{ code: 'crossover-near-resonance', message: 'x', corners: ['Vin nom, Iout nom'] }] }));
		expect(other.status).toBe('pass');
	});
});
