// Every demo template applies to a matching rail's starter design ("Boost Type III below
// the RHP zero" stored no crossover and failed with "crossoverHz is required for k-factor").
import { describe, expect, it } from 'vitest';
import { readForm, starterForm, type RailSummary } from '$lib/design/form';
import { analyzeDesign } from '$lib/engine';
import { boostRhpZeroHz, RHP_ZERO_CROSSOVER_FRACTION } from '$lib/engine/compensators/crossoverLimit';
import { designWithStrategy } from '$lib/server/services/template-use';

// The strategies as scripts/seed.ts stores them.
const DEMO = [
	{ topology: 'buck', compensator: { kind: 'type3', target: { method: 'k-factor', crossoverFraction: 0.1, phaseMarginDeg: 60 }, series: { resistors: 'E96', capacitors: 'E12' } } },
	{ topology: 'boost', compensator: { kind: 'type3', target: { method: 'k-factor', phaseMarginDeg: 55 }, series: { resistors: 'E96', capacitors: 'E12' } } }
] as const;
const RAILS: Record<'buck' | 'boost', RailSummary> = {
	buck: { name: '5V0_MAIN', topology: 'buck', vout: 5, vinNom: 24, vinMin: 18, vinMax: 32, ioutNom: 2.5, ioutMin: 0.25, ioutMax: 3.5, fsw: 400e3 },
	boost: { name: '12V0_BIAS', topology: 'boost', vout: 12, vinNom: 3.7, vinMin: 3.0, vinMax: 4.2, ioutNom: 0.1, ioutMin: 0.02, ioutMax: 0.15, fsw: 600e3 }
};

describe('demo templates on a matching rail', () => {
	for (const t of DEMO) {
		it(`${t.topology} ${t.compensator.kind} places without a contract error`, () => {
			const base = readForm(starterForm(RAILS[t.topology])).document as unknown as Record<string, unknown>;
			const design = designWithStrategy(base, t.compensator as never) as { compensator: { target: { crossoverHz: number } }; plant: { inductor: { l: number }; fsw: number } };
			const r = analyzeDesign(design);
			if ('error' in r) throw new Error(r.error.message);
			expect(r.metrics.crossoverHz).not.toBeNull();
			if (t.topology === 'boost') {
				const rail = RAILS.boost;
				const worst = boostRhpZeroHz({ vin: rail.vinMin, vout: rail.vout, iout: rail.ioutMax, l: design.plant.inductor.l });
				expect(design.compensator.target.crossoverHz).toBeLessThanOrEqual(RHP_ZERO_CROSSOVER_FRACTION * worst * (1 + 1e-12));
			}
		});
	}
});
