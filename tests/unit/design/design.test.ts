// The design screen's logic: reading the form, the nine corners, the drag preview and its
// hand-off to the engine, and the coarse grid margins used while dragging.
import { describe, expect, it } from 'vitest';
import { analyzeDesignDetailed, logGrid } from '$lib/engine';
import { analyzeForm } from '$lib/design/analysis';
import { demoForm, readForm } from '$lib/design/form';
import { gridMargins } from '$lib/design/gridMargins';
import { builtNetwork, manualPlacement, moveCorner, previewFrame, startDrag } from '$lib/design/preview';
import { verifyDesign, type Verification } from '$lib/engine';

function demoAnalysis() {
	const outcome = analyzeForm(readForm(demoForm()));
	if (!outcome.ok) throw new Error(outcome.message);
	return outcome.analysis;
}

describe('readForm', () => {
	it('reads engineering notation into SI numbers', () => {
		const r = readForm({ ...demoForm(), l: '4.7uH', fsw: '1.2MEG' });
		expect(r.errors).toEqual({});
		expect(r.document!.plant.inductor.l).toBeCloseTo(4.7e-6, 15);
		expect(r.document!.plant.fsw).toBe(1.2e6);
	});
	it('marks the field with the rule it breaks and gives no document', () => {
		const r = readForm({ ...demoForm(), l: '4.7x', vinMin: '1' });
		expect(r.errors.l).toMatch(/unknown prefix/);
		expect(r.errors.vinMin).toBe('a buck needs Vin min > Vout');
		expect(r.document).toBeNull();
	});
	it('refuses a zero inductance', () => expect(readForm({ ...demoForm(), l: '0' }).errors.l).toBe('must be > 0'));
});

describe('analyzeForm', () => {
	const a = demoAnalysis();
	it('analyses nine corners, nominal first, on one 400-point grid', () => {
		expect(a.corners).toHaveLength(9);
		expect(a.corners[0].corner.nominal).toBe(true);
		expect(a.freqHz).toHaveLength(400);
		for (const c of a.corners) expect(c.detail!.response.response.loop.magDb).toHaveLength(400);
	});
	it('meets the K-factor target at the nominal corner before rounding', () => {
		// K-factor placement makes PM at fc equal the target for the ideal network (docs/formulas.md §6.2).
		const ideal = a.nominal.compensator.achieved.ideal;
		expect(ideal.crossoverHz! / 60e3).toBeCloseTo(1, 3);
		expect(ideal.phaseMarginDeg!).toBeCloseTo(55, 1);
	});
	it('the document it saves carries the whole verification spec, and its verdict names the worst corner', () => {
		const doc = a.verifyDocument;
		expect(doc.sweep).toBeUndefined();
		expect(doc.targets).toEqual({ phaseMarginDeg: 55, gainMarginDb: 10, maxCrossoverFraction: 0.2 });
		expect(doc.corners).toEqual({ vin: { min: 10.8, max: 13.2 }, iout: { min: 2, max: 10 } });
		expect(doc.tolerances!.l).toEqual({ tol: 0.2, dist: 'normal', sigmas: 3 });
		expect(doc.spread).toEqual({ samples: 1000, seed: 1 });
		// a smaller spread keeps this unit test quick; the rule is the same
		const v = verifyDesign({ ...doc, spread: { samples: 50, seed: 1 } }) as Verification;
		const pm = v.rows.find((r) => r.metric === 'pm')!;
		// the corner label: operating case then the parts off nominal (engine corners/operatingCases.ts)
		expect(pm.corner).toMatch(/^Vin (min|nom|max), Iout (min|nom|max)(, .+ [+−][\d.]+ %)*$/);
		expect(pm.reason).toContain(pm.corner!);
		expect(v.corners.list[0].label).toBe('Vin nom, Iout nom');
	});
});

describe('drag preview', () => {
	const a = demoAnalysis();
	it('with nothing moved, reproduces the engine loop at every corner', () => {
		const s = startDrag(a);
		const frame = previewFrame(s, s.shape);
		if ('problem' in frame) throw new Error(frame.problem);
		a.corners.forEach((c, i) => {
			const engine = c.detail!.response.response.loop;
			for (const k of [0, 133, 266, 399]) {
				expect(frame.override.loops[i].magDb[k]).toBeCloseTo(engine.magDb[k], 6);
				expect(frame.override.loops[i].phaseDeg[k]).toBeCloseTo(engine.phaseDeg[k], 6);
			}
		});
	});
	it('moving a zero down raises the phase at crossover (a zero adds phase lead below fc)', () => {
		// A zero's phase lead atan(f/fz) grows as fz falls [common practice].
		const s = startDrag(a);
		const key = s.shape.kind === 'type3' ? 'zero1Hz' : 'zeroHz';
		const f0 = (s.shape as unknown as Record<string, number>)[key];
		const before = previewFrame(s, s.shape);
		const after = previewFrame(s, moveCorner(s.shape, key, f0 / 2));
		if ('problem' in before || 'problem' in after) throw new Error('unbuildable');
		const at = (fr: typeof before, i: number) => fr.override.compensator.phaseDeg[i];
		expect(at(after, 250)).toBeGreaterThan(at(before, 250));
	});
	it('refuses a zero dragged above its pole, with the reason', () => {
		const s = startDrag(a);
		const r = previewFrame(s, moveCorner(s.shape, s.shape.kind === 'type3' ? 'zero1Hz' : 'zeroHz', 1e7));
		expect('problem' in r && r.problem).toMatch(/below/);
	});
	it('hands the moved network to the engine as a manual placement that rebuilds it', () => {
		const s = startDrag(a);
		const moved = moveCorner(s.shape, s.shape.kind === 'type3' ? 'pole2Hz' : 'poleHz', 250e3);
		const m = manualPlacement(moved);
		const doc = structuredClone(a.document) as Record<string, any>;
		doc.compensator = { kind: moved.kind, target: { method: 'manual', zerosHz: m.zerosHz, polesHz: m.polesHz, midbandGainDb: m.midbandGainDb }, series: null };
		const r = analyzeDesignDetailed(doc);
		if ('error' in r) throw new Error(r.error.message);
		const frame = previewFrame(s, moved);
		if ('problem' in frame) throw new Error(frame.problem);
		for (const k of [0, 200, 399]) expect(r.response.response.compensator.magDb[k]).toBeCloseTo(frame.override.compensator.magDb[k], 6);
		expect(builtNetwork(a).shape.kind).toBe('type3');
	});
});

describe('gridMargins', () => {
	const f = logGrid(10, 1e7, 2000);
	it('an integrator ωc/s crosses at fc with PM 90° and has no gain margin', () => {
		// |T| = fc/f, ∠T = −90° everywhere [hand-derivable].
		const mag = f.map((x) => 20 * Math.log10(1e4 / x));
		const ph = f.map(() => -90);
		const m = gridMargins(f, mag, ph);
		expect(m.crossoverHz! / 1e4).toBeCloseTo(1, 3);
		expect(m.phaseMarginDeg).toBeCloseTo(90, 6);
		expect(m.gainMarginDb).toBeNull();
	});
	it('an integrator with a pole: PM = 90° − atan(fc/fp), GM from the −180° crossing', () => {
		// T = (ωI/s)·1/(1 + s/ωp)³ has its phase at −180° where 3·atan(f/fp) = 90° → f = fp·tan 30° [hand-derivable].
		const fI = 1e3;
		const fp = 1e5;
		const mag = f.map((x) => 20 * Math.log10(fI / x) - 30 * Math.log10(1 + (x / fp) ** 2));
		const ph = f.map((x) => -90 - 3 * (Math.atan(x / fp) * 180) / Math.PI);
		const m = gridMargins(f, mag, ph);
		const fc = m.crossoverHz!;
		expect(m.phaseMarginDeg!).toBeCloseTo(90 - 3 * (Math.atan(fc / fp) * 180) / Math.PI, 1);
		const fpc = fp * Math.tan(Math.PI / 6);
		expect(m.phaseCrossoverHz! / fpc).toBeCloseTo(1, 2);
		expect(m.gainMarginDb!).toBeCloseTo(-(20 * Math.log10(fI / fpc) - 30 * Math.log10(1 + (fpc / fp) ** 2)), 1);
	});
	it('skips non-finite samples instead of producing NaN', () => {
		const mag = f.map((x, i) => (i === 10 ? Number.NaN : 20 * Math.log10(1e4 / x)));
		const m = gridMargins(f, mag, f.map(() => -90));
		expect(Number.isFinite(m.crossoverHz!)).toBe(true);
	});
});

describe('capacitor derating fields', () => {
	it('read into the branch (class code, a DC-bias point, ageing in %) and back; a half-entered point names its field', async () => {
		const { formFromDocument } = await import('$lib/design/form');
		const form = demoForm();
		Object.assign(form.capacitors[0], { tempClass: 'x7r', biasV: '1.2', biasC: '30u', ageing: '3' });
		const r = readForm(form);
		expect(r.errors).toEqual({});
		expect(r.document!.plant.capacitors[0]).toMatchObject({ tempClass: 'X7R', dcBias: { points: [{ v: 1.2, c: 30e-6 }] }, ageing: 0.03 });
		const back = formFromDocument(r.document as never, null);
		expect(back.capacitors[0]).toMatchObject({ tempClass: 'X7R', biasV: '1.2V', biasC: '30µF', ageing: '3' });
		Object.assign(form.capacitors[0], { tempClass: 'X9Q', biasC: '' });
		const bad = readForm(form);
		expect(bad.errors['capacitors.0.tempClass']).toMatch(/class code/);
		expect(bad.errors['capacitors.0.biasC']).toMatch(/capacitance at that voltage/);
	});
});

describe('reopening a saved revision', () => {
	// A revision saved with a placement aimed above the verdict's PM target (the starter adds
	// headroom for the tolerance corners) must reopen as the same network: the form keeps the aim.
	it('keeps the placement PM when it differs from the verdict target, so the same parts come back', async () => {
		const { formFromDocument } = await import('$lib/design/form');
		type Doc = { compensator: Record<string, unknown> & { target?: unknown }; targets?: unknown };
		const saved = readForm(demoForm()).document as unknown as Doc;
		const doc: Doc = { ...saved, targets: { phaseMarginDeg: 50, gainMarginDb: 8 }, compensator: { ...saved.compensator, target: { method: 'k-factor', crossoverHz: 30e3, phaseMarginDeg: 60 } } };
		const reopened = readForm(formFromDocument(doc as never, null));
		expect(reopened.errors).toEqual({});
		const back = reopened.document as unknown as Doc;
		expect(back.compensator.target).toMatchObject({ method: 'k-factor', crossoverHz: 30e3, phaseMarginDeg: 60 });
		expect(back.targets).toMatchObject({ phaseMarginDeg: 50 });
		// A document without separate verdict targets places for what it says.
		const plain = { ...doc, targets: undefined };
		expect((readForm(formFromDocument(plain as never, null)).document as unknown as Doc).compensator.target).toMatchObject({ phaseMarginDeg: 60 });
	});
});
