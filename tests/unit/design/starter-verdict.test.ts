// A new rail's starter design passes its own verdict: the placement picks fc
// below the verdict's fsw limit and a boost's worst RHP zero by itself. On the old starter the
// boost 5 → 12 V, 1 A, 500 kHz failed (fc 50 kHz above its RHP zero, PM negative at corners) and
// the bucks missed the PM target at their tolerance corners.
import { describe, expect, it } from 'vitest';
import { readForm, starterForm, type RailSummary } from '$lib/design/form';
import { verifyDesign } from '$lib/engine';
import { boostRhpZeroHz, RHP_ZERO_CROSSOVER_FRACTION } from '$lib/engine/compensators/crossoverLimit';
import { parseQuantity } from '$lib/units';

// Sensible rails [common practice: point-of-load bucks and small boosts, ranges ±10 %, light load 10–30 %].
const RAILS: RailSummary[] = [
	{ name: 'BOOST_12V', topology: 'boost', vout: 12, vinNom: 5, vinMin: 5, vinMax: 5, ioutNom: 1, ioutMin: 1, ioutMax: 1, fsw: 500e3 },
	{ name: 'BOOST_12V_R', topology: 'boost', vout: 12, vinNom: 5, vinMin: 4.5, vinMax: 5.5, ioutNom: 1, ioutMin: 0.3, ioutMax: 1.2, fsw: 500e3 },
	{ name: 'BOOST_5V', topology: 'boost', vout: 5, vinNom: 3.3, vinMin: 3, vinMax: 3.6, ioutNom: 0.5, ioutMin: 0.1, ioutMax: 0.6, fsw: 1e6 },
	{ name: 'VDD_1V8', topology: 'buck', vout: 1.8, vinNom: 12, vinMin: 10, vinMax: 14, ioutNom: 3, ioutMin: 1, ioutMax: 4, fsw: 500e3 },
	{ name: '3V3', topology: 'buck', vout: 3.3, vinNom: 5, vinMin: 4.5, vinMax: 5.5, ioutNom: 2, ioutMin: 0.2, ioutMax: 3, fsw: 1e6 },
	{ name: '5V0', topology: 'buck', vout: 5, vinNom: 24, vinMin: 18, vinMax: 32, ioutNom: 2.5, ioutMin: 0.25, ioutMax: 3.5, fsw: 400e3 }
];

describe('starterForm passes its own verdict', { timeout: 120_000 }, () => {
	for (const rail of RAILS) {
		it(`${rail.name} (${rail.topology} ${rail.vinNom} → ${rail.vout} V, ${rail.ioutNom} A, ${rail.fsw / 1e3} kHz)`, () => {
			const form = starterForm(rail);
			const read = readForm(form);
			expect(read.errors).toEqual({});
			const v = verifyDesign(read.document);
			if ('error' in v) throw new Error(v.error.message);
			const notPassing = v.rows.filter((r) => r.status !== 'pass').map((r) => `${r.metric}: ${r.reason}`);
			expect(notPassing, rail.name).toEqual([]);
			expect(v.status).toBe('pass');
			const fc = parseQuantity(form.fcTarget, { unit: 'Hz' });
			if (!fc.ok) throw new Error(fc.error);
			expect(fc.value).toBeLessThanOrEqual(rail.fsw / 10);
			if (rail.topology === 'boost') {
				const l = parseQuantity(form.l, { unit: 'H' });
				if (!l.ok) throw new Error(l.error);
				const worst = boostRhpZeroHz({ vin: rail.vinMin, vout: rail.vout, iout: rail.ioutMax, l: l.value });
				expect(fc.value).toBeLessThanOrEqual(RHP_ZERO_CROSSOVER_FRACTION * worst);
			}
		});
	}
});
