import { describe, expect, it } from 'vitest';
import { fitDesign, type FitResult } from '$lib/engine/fit';
import { parseBenchFile } from '$lib/bench/parse';
import { DEMO_BENCH, demoBenchCsv, demoBenchDesign, demoBenchText } from '../../../scripts/demo-bench';

// The demo rail's bench file (demo/1V0_CORE-loop-gain.csv): invented data made from the rail's
// model with the polymer capacitor's ESR at 2.5 × typed. The walk-through in the README depends on
// the fit finding exactly that.
const read = (text: string) => {
	const p = parseBenchFile(text);
	if (!p.ok) throw new Error(JSON.stringify(p.errors));
	return p.data;
};

describe('the demo bench file', () => {
	it('is what scripts/demo-bench.ts makes from the demo rail’s model (regenerate it when the model moves)', () => {
		const committed = read(demoBenchText());
		const fresh = read(demoBenchCsv());
		expect(committed.freqHz.length).toBe(161);
		committed.magDb.forEach((db, i) => expect(Math.abs(db - fresh.magDb[i])).toBeLessThan(0.01));
		committed.phaseDeg.forEach((deg, i) => expect(Math.abs(deg - fresh.phaseDeg[i])).toBeLessThan(0.05));
	});

	it('leads the fit of the walk-through to the polymer ESR, with the generator’s value inside its interval', () => {
		const r = fitDesign({
			document: demoBenchDesign(),
			measurement: read(demoBenchText()),
			request: { parameters: [{ name: 'l' }, { name: 'c', branch: 0 }, { name: 'esr', branch: 0 }, { name: 'c', branch: 1 }, { name: 'esr', branch: 1 }] },
			measuredKind: 'loop',
			vin: DEMO_BENCH.metadata.vin,
			iout: DEMO_BENCH.metadata.iout
		});
		if ('error' in r) throw new Error(r.error.message);
		const fit = r as FitResult;
		const named = fit.parameters[fit.explainedBy!];
		expect(named.label).toBe('ESR (branch 2)');
		// The generator's deliberate fault: 2.5 × the typed 12 mΩ [scripts/demo-bench.ts, DEMO_BENCH.fault].
		const truth = DEMO_BENCH.fault.factor * named.typed;
		expect(named.interval!.low).toBeLessThanOrEqual(truth);
		expect(named.interval!.high).toBeGreaterThanOrEqual(truth);
		// The other parts were not changed: each stays within 5 % of typed (noise 0.05 dB / 0.3°).
		for (const p of fit.parameters) if (p !== named) expect(Math.abs(p.change!)).toBeLessThan(0.05);
		// The two glitched points are the outliers the robust loss sets aside.
		expect(fit.outliers).toBe(2);
	});
});
