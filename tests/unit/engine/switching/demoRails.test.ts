/**
 * The switching check on the demo seed's bucks (scripts/demo-rails.ts): every one crosses over at
 * fsw/8 or below, where averaging holds, so the switched circuit must agree with the averaged
 * margins within the check's own tolerance (3° in PM, 10 % in fc) and say so.
 */
import { describe, expect, it } from 'vitest';
import { gateway, sensorNode } from '../../../../scripts/demo-rails';
import { switchingCheckOfDesign } from '$lib/engine/pipeline/switchingCircuit';

const bucks = [...gateway, ...sensorNode]
	.filter((s) => s.rail.topology === 'buck')
	.flatMap((s) => s.revisions.map((r, i) => [`${s.rail.name} r${i + 1}`, r.design] as const));

describe('switching check of the demo bucks', () => {
	it('covers every demo buck revision', () => {
		expect(bucks.length).toBeGreaterThanOrEqual(5);
	});

	it.each(bucks)('%s agrees with the averaged margins', (_name, design) => {
		const r = switchingCheckOfDesign(design);
		if ('error' in r) throw new Error(r.error.message);
		// [published: Erickson & Maksimović, Fundamentals of Power Electronics, Ch. 7 — the averaged
		// model holds for signals well below fsw; these bucks cross over at fsw/20 … fsw/11]
		expect(r.status, r.caution ?? r.reason ?? '').toBe('agrees');
		expect(Math.abs(r.switching.phaseMarginDeg! - r.averaged.phaseMarginDeg!)).toBeLessThan(3);
		expect(Math.abs(r.switching.crossoverHz! / r.averaged.crossoverHz! - 1)).toBeLessThan(0.1);
		expect(r.orbit!.reading).toBe('stable');
	});
});
