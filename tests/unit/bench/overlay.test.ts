import { describe, expect, it } from 'vitest';
import { benchMetadataSchema, benchOverlay, parseBenchFile, sampledEvaluator } from '$lib/bench';
import { expected, fixture } from './fixtures';

describe('benchOverlay', () => {
	it('a loop file against itself as the model: margins as measured, zero deviation, band clipped to fsw/2', () => {
		const r = parseBenchFile(fixture('buck-type3-loop.csv'));
		if (!r.ok) throw new Error(JSON.stringify(r.errors));
		const o = benchOverlay(r.data, sampledEvaluator(r.data), { kind: 'loop', fswHz: 400e3 });
		// [scipy: reference/bench/generate.py] fc and PM of the exact loop
		expect(Math.abs(o.metrics!.crossoverHz! / expected.files['buck-type3-loop.csv'].crossoverHz! - 1)).toBeLessThan(0.005);
		if (!o.deviation.ok) throw new Error(o.deviation.message);
		expect(o.deviation.deviation.stopHz).toBeLessThanOrEqual(200e3);
		expect(o.deviation.deviation.magDb.maxAbs).toBeLessThan(1e-9);
	});

	it('a plant file has no margins', () => {
		const o = benchOverlay({ freqHz: [10, 100], magDb: [0, -1], phaseDeg: [0, -5] }, () => ({ magDb: 0, phaseDeg: 0 }), { kind: 'plant' });
		expect(o.metrics).toBeNull();
	});
});

describe('benchMetadataSchema', () => {
	it('accepts the conditions and fills defaults; rejects a bad date and a negative current with the field', () => {
		const ok = benchMetadataSchema.parse({ vin: 12, iout: 2, instrument: 'FRA', measuredAt: '2026-11-30' });
		expect(ok.kind).toBe('loop');
		const bad = benchMetadataSchema.safeParse({ iout: -1, measuredAt: '30.11.2026' });
		expect(bad.success).toBe(false);
		const paths = bad.error!.issues.map((i) => i.path.join('.'));
		expect(paths).toEqual(expect.arrayContaining(['iout', 'measuredAt']));
	});
});
