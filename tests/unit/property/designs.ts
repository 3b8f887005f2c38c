// fast-check generators of design documents (contract v1): valid ones spread over the space a
// power engineer meets (buck and boost, ceramic and bulk banks, every compensator kind, placed
// by the engine or given as parts, finite op-amps, delay, feed-forward, custom sweeps), and
// invalid ones made by breaking exactly one rule at a known path.
import fc from 'fast-check';

const logUniform = (min: number, max: number) =>
	fc.double({ min: Math.log10(min), max: Math.log10(max), noNaN: true }).map((e) => 10 ** e);

// A branch with ESL but no ESR has an undamped series resonance (a zero pair on the jω axis, a
// notch to −∞ dB): kept in on purpose, it once hid the gain crossings just above the notch.
const capacitorBranch = fc.record({
	c: logUniform(1e-7, 2e-3),
	esr: fc.oneof(fc.constant(0), logUniform(1e-4, 0.2)),
	esl: fc.oneof(fc.constant(0), logUniform(1e-11, 5e-9)),
	count: fc.integer({ min: 1, max: 6 })
});

/** A power stage in CCM at its nominal load, most of the time (the ripple ratio sets L). */
const plant = fc
	.record({
		topology: fc.constantFrom('buck', 'boost'),
		vin: logUniform(2, 60),
		ratio: fc.double({ min: 0.1, max: 0.85, noNaN: true }),
		boostGain: fc.double({ min: 1.15, max: 3.5, noNaN: true }),
		iout: logUniform(0.05, 25),
		fsw: logUniform(5e4, 3e6),
		rippleRatio: fc.double({ min: 0.1, max: 1.5, noNaN: true }),
		dcr: fc.oneof(fc.constant(0), logUniform(1e-4, 0.05)),
		rdsOn: fc.oneof(fc.constant(0), logUniform(1e-4, 0.03)),
		capacitors: fc.array(capacitorBranch, { minLength: 1, maxLength: 3 })
	})
	.map((p) => {
		const vout = p.topology === 'buck' ? p.vin * p.ratio : p.vin * p.boostGain;
		const duty = p.topology === 'buck' ? vout / p.vin : 1 - p.vin / vout;
		// ΔiL = ripple·IL from the CCM ripple formulas [published: E&M Ch. 2].
		const il = p.topology === 'buck' ? p.iout : p.iout / (1 - duty);
		const l = p.topology === 'buck' ? (vout * (1 - duty)) / (p.fsw * p.rippleRatio * il) : (p.vin * duty) / (p.fsw * p.rippleRatio * il);
		return {
			topology: p.topology,
			vin: p.vin,
			vout,
			iout: p.iout,
			fsw: p.fsw,
			inductor: { l, dcr: p.dcr },
			capacitors: p.capacitors,
			rdsOn: p.rdsOn
		};
	});

const series = fc.oneof(
	fc.constant(undefined),
	fc.constant(null),
	fc.record({
		resistors: fc.constantFrom('E24', 'E48', 'E96', 'E192', null),
		capacitors: fc.constantFrom('E6', 'E12', 'E24', null)
	})
);

const opamp = fc.oneof(fc.constant(undefined), fc.record({ a0Db: fc.double({ min: 60, max: 130, noNaN: true }), gbw: logUniform(1e6, 1e8) }));

/** Network parts around typical values; with R1 = 10 kΩ these give any gain from far too low to far too high. */
const parts = fc.record({
	r2: logUniform(100, 1e6),
	r3: logUniform(10, 1e5),
	c1: logUniform(1e-11, 1e-6),
	c2: logUniform(1e-12, 1e-8),
	c3: logUniform(1e-11, 1e-7),
	gm: logUniform(1e-5, 5e-3)
});

const compensator = fc
	.record({
		kind: fc.constantFrom('type1', 'type2', 'type3', 'type2-ota'),
		how: fc.constantFrom('k-factor', 'features', 'parts'),
		crossoverRel: fc.double({ min: 0.01, max: 0.25, noNaN: true }),
		phaseMarginDeg: fc.double({ min: 25, max: 80, noNaN: true }),
		series,
		opamp,
		parts
	})
	.map((c) => {
		const out: Record<string, unknown> = { kind: c.kind };
		if (c.series !== undefined) out.series = c.series;
		if (c.opamp && c.kind !== 'type2-ota') out.opamp = c.opamp;
		const p = c.parts;
		if (c.how === 'parts') {
			out.parts =
				c.kind === 'type1'
					? { c1: p.c1 }
					: c.kind === 'type2'
						? { r2: p.r2, c1: p.c1, c2: p.c2 }
						: c.kind === 'type3'
							? { r2: p.r2, r3: p.r3, c1: p.c1, c2: p.c2, c3: p.c3 }
							: { gm: p.gm, r2: p.r2, c1: p.c1, c2: p.c2 };
		} else {
			if (c.kind === 'type2-ota') out.parts = { gm: p.gm };
			// crossoverHz is filled in relative to fsw by `design` below.
			out.target = { method: c.how, crossoverRel: c.crossoverRel, phaseMarginDeg: c.phaseMarginDeg };
		}
		return out;
	});

const sweep = fc.oneof(
	fc.constant(undefined),
	fc.record({ startRel: logUniform(1e-4, 0.1), stopRel: logUniform(0.2, 5), points: fc.integer({ min: 2, max: 800 }) }),
	fc.array(logUniform(1e-4, 5), { minLength: 1, maxLength: 60 })
);

/** A document that passes the schema (the engine may still refuse its operating point or compensator). */
export const validDesign = fc
	.record({
		plant,
		modulator: fc.record({
			vramp: logUniform(0.3, 5),
			feedForward: fc.boolean(),
			delay: fc.oneof(fc.constant(0), logUniform(1e-9, 4e-7))
		}),
		vrefRel: fc.double({ min: 0.05, max: 1, noNaN: true }),
		r1: logUniform(1e3, 1e5),
		compensator,
		sweep
	})
	.map((d) => {
		const fsw = d.plant.fsw;
		const comp = { ...d.compensator };
		if (comp.target) {
			const { crossoverRel, ...rest } = comp.target as { crossoverRel: number };
			comp.target = { ...rest, crossoverHz: crossoverRel * fsw };
		}
		const doc: Record<string, unknown> = {
			schemaVersion: 1,
			plant: d.plant,
			modulator: d.modulator,
			feedback: { vref: Math.min(d.plant.vout, 0.3 + d.vrefRel * 2), r1: d.r1 },
			compensator: comp
		};
		if (Array.isArray(d.sweep)) doc.sweep = { freqHz: d.sweep.map((x) => x * fsw) };
		else if (d.sweep) doc.sweep = { startHz: d.sweep.startRel * fsw, stopHz: d.sweep.stopRel * fsw, points: d.sweep.points };
		return doc;
	});

/** One broken rule: the dotted path it lives at, and a value (or removal) that breaks it. */
export interface Breakage {
	path: string;
	/** `undefined` removes the key. */
	value: unknown;
}

const notANumber = fc.constantFrom<unknown>('1', '4.7u', null, true, [], {}, 'NaN');
const notPositive = fc.oneof(fc.constantFrom<unknown>(0, -1, -1e-9, -1e300), fc.double({ max: -1e-12, noNaN: true, noDefaultInfinity: true }));
const negative = fc.oneof(fc.constantFrom<unknown>(-1, -1e-9), fc.double({ max: -1e-12, noNaN: true, noDefaultInfinity: true }));

/** Paths of required numbers that must be > 0, and of optional ones that must be ≥ 0. */
const POSITIVE = ['plant.vin', 'plant.vout', 'plant.iout', 'plant.fsw', 'plant.inductor.l', 'plant.capacitors.0.c', 'modulator.vramp', 'feedback.vref', 'feedback.r1'];
const NON_NEGATIVE = ['plant.inductor.dcr', 'plant.capacitors.0.esr', 'plant.capacitors.0.esl', 'plant.rdsOn', 'modulator.delay'];
const REQUIRED = ['schemaVersion', 'plant', 'modulator', 'feedback', 'compensator', 'plant.topology', 'plant.vin', 'plant.vout', 'plant.iout', 'plant.fsw', 'plant.inductor', 'plant.inductor.l', 'plant.capacitors', 'plant.capacitors.0.c', 'modulator.vramp', 'feedback.vref', 'feedback.r1', 'compensator.kind'];

export const breakage: fc.Arbitrary<Breakage> = fc.oneof(
	fc.record({ path: fc.constantFrom(...POSITIVE), value: fc.oneof(notPositive, notANumber) }),
	fc.record({ path: fc.constantFrom(...NON_NEGATIVE), value: fc.oneof(negative, notANumber) }),
	fc.record({ path: fc.constantFrom(...REQUIRED), value: fc.constant(undefined) }),
	fc.record({ path: fc.constant('schemaVersion'), value: fc.constantFrom<unknown>(0, 2, '1', null) }),
	fc.record({ path: fc.constant('plant.topology'), value: fc.constantFrom<unknown>('flyback', 'Buck', '', 3) }),
	fc.record({ path: fc.constant('compensator.kind'), value: fc.constantFrom<unknown>('type4', 'pid', '', null) }),
	fc.record({ path: fc.constant('plant.capacitors'), value: fc.constantFrom<unknown>([], 'ceramic', {}) }),
	fc.record({ path: fc.constant('plant.capacitors.0.count'), value: fc.constantFrom<unknown>(0, 1.5, -2, 1001) }),
	fc.record({ path: fc.constant('modulator.feedForward'), value: fc.constantFrom<unknown>('yes', 1, null) }),
	fc.record({ path: fc.constantFrom('plant', 'modulator', 'feedback', 'plant.inductor'), value: fc.constantFrom<unknown>('x', 5, null, []) }),
	fc.record({ path: fc.constant('plant.fsw'), value: fc.constantFrom<unknown>(2e9, 1e300) }),
	fc.record({ path: fc.constant('sweep'), value: fc.constantFrom<unknown>({ startHz: 1e5, stopHz: 10 }, { points: 1 }, { freqHz: [] }, { freqHz: [-1] }, 'log') })
);

/** The document with one rule broken (deep copy; arrays addressed by index). */
export function breakDocument(doc: Record<string, unknown>, b: Breakage): Record<string, unknown> {
	const copy = structuredClone(doc);
	const keys = b.path.split('.');
	let node: Record<string, unknown> = copy;
	for (const key of keys.slice(0, -1)) {
		if (node[key] === null || typeof node[key] !== 'object') node[key] = {};
		node = node[key] as Record<string, unknown>;
	}
	const last = keys[keys.length - 1];
	if (b.value === undefined) delete node[last];
	else node[last] = b.value;
	return copy;
}

/** True when a reported field lies on the broken path: the path itself or a field inside it. */
export function namesPath(fields: Record<string, string>, path: string): boolean {
	return Object.keys(fields).some((key) => key === path || key.startsWith(path + '.'));
}
