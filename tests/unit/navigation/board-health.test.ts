// Board health reads the verdict stored with the latest revision and judges nothing itself:
// a stored verdict shows as stored (status, reasons, corners), even when the figures would
// read otherwise against today's defaults, and its text is the shared verdictFigures text.
import { describe, expect, it } from 'vitest';
import type { LoopSummary, Verification } from '$lib/client/types';
import { verdictFigures } from '$lib/verdict/figures';
import { railHealth } from '../../../src/routes/(app)/w/[workspace]/projects/[project]/health';

function stored(over: Partial<Verification> = {}): Verification {
	return {
		engineVersion: 'test',
		status: 'caution',
		summary: 'PM 47.2° at Vin min, Iout max is below the 50° target',
		rows: [
			{ metric: 'pm', status: 'caution', value: 47.2, target: '≥ 50°', corner: 'Vin min, Iout max', reason: 'PM 47.2° is 2.8° short of 50°' },
			{ metric: 'gm', status: 'pass', value: 14.1, target: '≥ 10 dB', corner: 'Vin max, Iout min', reason: 'meets the target' },
			{ metric: 'fc', status: 'pass', value: 61e3, target: '≤ 100 kHz', corner: 'Vin max, Iout min', reason: 'within the limit' },
			{ metric: 'yield', status: 'caution', value: 0.984, target: '100%', corner: null, reason: '1.6% of samples miss a target' }
		],
		targets: { phaseMarginDeg: 50, gainMarginDb: 10, maxCrossoverFraction: 0.2 },
		nominal: { crossoverHz: 50e3, phaseMarginDeg: 55, gainMarginDb: 16, closedLoopStable: true, modulusMargin: 0.6 },
		worst: {
			phaseMarginDeg: { value: 47.2, corner: 'Vin min, Iout max' },
			gainMarginDb: { value: 14.1, corner: 'Vin max, Iout min' },
			crossoverLowHz: { value: 38e3, corner: 'Vin min, Iout max' },
			crossoverHighHz: { value: 61e3, corner: 'Vin max, Iout min' }
		},
		corners: { mode: 'one-at-a-time', count: 279, unstable: 0, failed: 0, list: [] },
		spread: { samples: 500, seed: 1, yield: 0.984, stable: 1 },
		warnings: [],
		parts: { ideal: { r2: 12e3 }, rounded: { r2: 12.1e3 }, series: { resistors: 'E96', capacitors: 'E12' } },
		...over
	} as Verification;
}
function loop(verification: Verification | null): LoopSummary {
	return { id: 'l', railId: 'r', revision: 1, status: 'draft', message: 'm', verification, engineVersion: verification?.engineVersion ?? null, authorName: null, createdAt: '' };
}

describe('railHealth', () => {
	it('shows the stored worst values with the corner that sets each, as verdictFigures writes them', () => {
		const v = stored();
		const h = railHealth(loop(v));
		const f = verdictFigures(v);
		expect(h.pm).toMatchObject({ value: 47.2, text: f.pm, corner: 'Vin min, Iout max', status: 'caution' });
		expect(h.gm).toMatchObject({ value: 14.1, text: f.gm, corner: 'Vin max, Iout min', status: 'pass' });
		expect(h.fc).toMatchObject({ value: 61e3, text: f.fc, status: 'pass' });
		expect(h.yield).toMatchObject({ value: 0.984, text: f.yield, status: 'caution' });
		// [from memory] the d3-format spec ".1f" with U+00B0, engineering "61 kHz", one-decimal percent.
		expect([h.pm.text, h.gm.text, h.fc.text, h.yield.text]).toEqual(['47.2°', '14.1 dB', '61 kHz', '98.4%']);
		expect(h.overall).toBe('caution');
		expect(h.summary).toBe(v.summary);
	});

	it('names a corner with many part tolerances briefly in the summary; the rows keep its full name', () => {
		const corner = 'Vin max, Iout min, L −20 %, DCR −10 %, C −30 %, ESR +50 %';
		const v = stored({ summary: `Worst PM 41.9° at ${corner} is below the 50.0° target.`, rows: [{ metric: 'pm', status: 'fail', value: 41.9, target: '≥ 50°', corner, reason: 'r' }] });
		const h = railHealth(loop(v));
		expect(h.summary).toBe('Worst PM 41.9° at Vin max, Iout min with 4 part tolerances is below the 50.0° target.');
		expect(v.rows[0].corner).toBe(corner);
	});

	it('never re-judges: a stored pass stays pass even with a PM that today’s default would fail', () => {
		const v = stored({ status: 'pass', summary: 'meets every target', rows: [{ metric: 'pm', status: 'pass', value: 31, target: '≥ 30°', corner: 'nominal', reason: 'ok' }], worst: { ...stored().worst, phaseMarginDeg: { value: 31, corner: 'nominal' } } });
		const h = railHealth(loop(v));
		expect(h.overall).toBe('pass');
		expect(h.pm).toMatchObject({ value: 31, status: 'pass' });
	});

	it('says "no loop" for a rail never saved and "not verified" for a row without a stored verdict', () => {
		expect(railHealth(null)).toMatchObject({ overall: 'none', pm: { status: 'none', value: null } });
		expect(railHealth(loop(null))).toMatchObject({ overall: 'none', summary: expect.stringContaining('no stored verdict') });
	});
});
