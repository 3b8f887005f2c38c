// The board's worst-case verdict from stored corner metrics. Thresholds [common practice,
// as on the design screen]: PM up to 5° short or GM up to 3 dB short is a caution, more is a
// fail; fc above the target fraction of fsw a caution, above fsw/2 a fail.
import { describe, expect, it } from 'vitest';
import type { CornerMetrics, LoopSummary } from '$lib/client/types';
import { railHealth } from '../../../src/routes/(app)/w/[workspace]/projects/[project]/health';

const targets = { phaseMarginDeg: 45, gainMarginDb: 10, maxCrossoverFraction: 0.2 };
const fsw = 500e3;

function corner(label: string, fc: number | null, pm: number | null, gm: number | null, extra: Partial<CornerMetrics> = {}): CornerMetrics {
	return { corner: { vin: 12, iout: 1, label }, crossoverHz: fc, phaseMarginDeg: pm, gainMarginDb: gm, closedLoopStable: true, warnings: [], ...extra };
}
function loop(metrics: CornerMetrics[]): LoopSummary {
	return { id: 'l', railId: 'r', revision: 1, status: 'draft', message: 'm', metrics, authorName: null, createdAt: '' };
}

describe('railHealth', () => {
	it('takes the highest fc and the lowest PM and GM, each with the corner that sets it', () => {
		const h = railHealth(loop([corner('Vin nom, Iout max', 40e3, 60, 18), corner('Vin max, Iout min', 62e3, 51, 14), corner('Vin min, Iout max', 35e3, 66, 12)]), targets, fsw);
		expect(h.fc).toMatchObject({ value: 62e3, corner: 'Vin max, Iout min', status: 'pass' });
		expect(h.pm).toMatchObject({ value: 51, corner: 'Vin max, Iout min', status: 'pass' });
		expect(h.gm).toMatchObject({ value: 12, corner: 'Vin min, Iout max', status: 'pass' });
		expect(h.overall).toBe('pass');
		expect(h.summary).toBe('meets every target at all 3 corners');
	});

	it('grades a phase margin 3° short as caution and 8° short as fail, and says where', () => {
		expect(railHealth(loop([corner('A', 40e3, 42, 15)]), targets, fsw).pm.status).toBe('caution');
		const failing = railHealth(loop([corner('A', 40e3, 60, 15), corner('Vin max, Iout min', 40e3, 37, 15)]), targets, fsw);
		expect(failing.overall).toBe('fail');
		expect(failing.summary).toMatch(/^PM 37\.0° at Vin max, Iout min, below the 45\.0° target$/);
	});

	it('grades the gain margin against its target less 3 dB', () => {
		expect(railHealth(loop([corner('A', 40e3, 60, 8)]), targets, fsw).gm.status).toBe('caution');
		expect(railHealth(loop([corner('A', 40e3, 60, 6.5)]), targets, fsw).gm.status).toBe('fail');
		// No −180° crossing at any corner: no gain margin to fall short of.
		expect(railHealth(loop([corner('A', 40e3, 60, null)]), targets, fsw).gm.status).toBe('pass');
	});

	it('flags a crossover above 0.2 × fsw as caution and above fsw/2 as fail', () => {
		expect(railHealth(loop([corner('A', 120e3, 60, 15)]), targets, fsw).fc.status).toBe('caution');
		expect(railHealth(loop([corner('A', 260e3, 60, 15)]), targets, fsw).fc.status).toBe('fail');
	});

	it('fails a loop with no crossover, an unstable corner or a corner the engine refused', () => {
		expect(railHealth(loop([corner('A', null, null, null)]), targets, fsw).overall).toBe('fail');
		const unstable = railHealth(loop([corner('Vin min, Iout max', 40e3, 60, 15, { closedLoopStable: false })]), targets, fsw);
		expect(unstable).toMatchObject({ overall: 'fail', summary: 'closed loop unstable at Vin min, Iout max' });
		const refused = railHealth(loop([corner('A', 40e3, 60, 15), corner('B', null, null, null, { error: 'duty above 95%' })]), targets, fsw);
		expect(refused.overall).toBe('fail');
		expect(refused.summary).toContain('duty above 95%');
	});

	it('says "no loop" for a rail never saved', () => {
		expect(railHealth(null, targets, fsw)).toMatchObject({ overall: 'none', pm: { status: 'none', value: null } });
	});
});
