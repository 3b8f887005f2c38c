// Compensator networks ↔ their corner frequencies (ideal amplifier), both directions, exact.
// Names as docs/formulas.md §0: R1 input/divider top, Rb divider bottom, R2+C1 in series in the feedback path,
// C2 across it, R3+C3 in series across R1 (Type III); the OTA drives R2+C1 ∥ C2 to ground with the divider in the loop.
// Formulas: docs/formulas.md §5.1–§5.3 and §5.5 (standard inverting-amplifier algebra; Venable 1983 layout). Hz throughout.
import { formatEng } from '../../units/format';

export const COMPENSATOR_KINDS = ['type1', 'type2', 'type3', 'type2-ota'] as const;
export type CompensatorKind = (typeof COMPENSATOR_KINDS)[number];

/** Divider: r1 from the output to the feedback node, rb from there to ground; rb null when Vout = Vref (none fitted). */
export interface Divider {
	r1: number;
	rb: number | null;
}

export interface Type1Parts extends Divider {
	kind: 'type1';
	c1: number;
}
export interface Type2Parts extends Divider {
	kind: 'type2';
	r2: number;
	c1: number;
	c2: number;
}
export interface Type3Parts extends Divider {
	kind: 'type3';
	r2: number;
	r3: number;
	c1: number;
	c2: number;
	c3: number;
}
/** gm in siemens; ro = OTA output resistance (null or absent = ideal current source). */
export interface Type2OtaParts extends Divider {
	kind: 'type2-ota';
	gm: number;
	r2: number;
	c1: number;
	c2: number;
	ro?: number | null;
}
export type NetworkParts = Type1Parts | Type2Parts | Type3Parts | Type2OtaParts;

/**
 * Corner frequencies of Gc = (ωI/s)·Π(1 + s/ωz)/Π(1 + s/ωp) with an ideal amplifier.
 * integratorHz = ωI/2π (where the integrator alone has unity gain). For type2-ota it includes the divider ratio H.
 * Type III pairs (zero1Hz, pole1Hz) with the feedback branch and (zero2Hz, pole2Hz) with the input branch.
 */
export type NetworkShape =
	| { kind: 'type1'; integratorHz: number }
	| { kind: 'type2' | 'type2-ota'; integratorHz: number; zeroHz: number; poleHz: number }
	| { kind: 'type3'; integratorHz: number; zero1Hz: number; pole1Hz: number; zero2Hz: number; pole2Hz: number };

const TWO_PI = 2 * Math.PI;

/** H = Rb/(R1 + Rb); 1 when no bottom resistor is fitted. */
export function dividerRatio(d: Divider): number {
	return d.rb === null ? 1 : d.rb / (d.r1 + d.rb);
}

/** Bottom resistor for Vout from Vref: Rb = R1·Vref/(Vout − Vref) (§3). null when Vout = Vref. */
export function bottomResistor(r1: number, vout: number, vref: number): number | null {
	if (!(vref > 0) || !(vout >= vref)) {
		throw new RangeError(`divider needs 0 < vref ≤ vout, got vref=${vref} V, vout=${vout} V`);
	}
	return vout === vref ? null : (r1 * vref) / (vout - vref);
}

/** Top resistor for a chosen divider current I (through R1 and Rb alike): R1 = (Vout − Vref)/I. */
export function topResistorFromCurrent(vout: number, vref: number, currentA: number): number {
	if (!(currentA > 0) || !(vout > vref) || !(vref > 0)) {
		throw new RangeError(`divider current needs current > 0 and 0 < vref < vout, got I=${currentA} A`);
	}
	return (vout - vref) / currentA;
}

/** Output voltage the divider actually sets: Vref·(1 + R1/Rb). */
export function dividerVout(d: Divider, vref: number): number {
	return d.rb === null ? vref : vref * (1 + d.r1 / d.rb);
}

/** Parts → corner frequencies (exact forms of §5.1–§5.3, §5.5; ro is ignored here, see the transfer function). */
export function shapeFromParts(p: NetworkParts): NetworkShape {
	switch (p.kind) {
		case 'type1':
			return { kind: 'type1', integratorHz: 1 / (TWO_PI * p.r1 * p.c1) };
		case 'type2':
		case 'type2-ota': {
			const csum = p.c1 + p.c2;
			const omegaI = p.kind === 'type2' ? 1 / (p.r1 * csum) : (dividerRatio(p) * p.gm) / csum;
			return {
				kind: p.kind,
				integratorHz: omegaI / TWO_PI,
				zeroHz: 1 / (TWO_PI * p.r2 * p.c1),
				poleHz: csum / (TWO_PI * p.r2 * p.c1 * p.c2)
			};
		}
		case 'type3': {
			const csum = p.c1 + p.c2;
			return {
				kind: 'type3',
				integratorHz: 1 / (TWO_PI * p.r1 * csum),
				zero1Hz: 1 / (TWO_PI * p.r2 * p.c1),
				pole1Hz: csum / (TWO_PI * p.r2 * p.c1 * p.c2),
				zero2Hz: 1 / (TWO_PI * (p.r1 + p.r3) * p.c3),
				pole2Hz: 1 / (TWO_PI * p.r3 * p.c3)
			};
		}
	}
}

/** Why a shape cannot be built, or null. A zero must sit below its paired pole (C1, R3 would go negative). */
export function shapeProblem(shape: NetworkShape): string | null {
	const corners = Object.entries(shape).filter(([key]) => key !== 'kind') as [string, number][];
	for (const [key, value] of corners) {
		if (!Number.isFinite(value) || value <= 0) return `${key} must be a finite frequency > 0 Hz (got ${value})`;
	}
	if (shape.kind === 'type2' || shape.kind === 'type2-ota') {
		if (!(shape.zeroHz < shape.poleHz)) {
			return `the zero (${fmtHz(shape.zeroHz)}) must lie below the pole (${fmtHz(shape.poleHz)})`;
		}
	}
	if (shape.kind === 'type3') {
		if (!(shape.zero1Hz < shape.pole1Hz)) {
			return `the feedback zero (${fmtHz(shape.zero1Hz)}) must lie below the feedback pole (${fmtHz(shape.pole1Hz)})`;
		}
		if (!(shape.zero2Hz < shape.pole2Hz)) {
			return `the input-branch zero (${fmtHz(shape.zero2Hz)}) must lie below its pole (${fmtHz(shape.pole2Hz)})`;
		}
	}
	return null;
}

/** Amplifier-side inputs of the inverse: the divider, and gm for the OTA. */
export interface SynthesisInputs extends Divider {
	gm?: number;
	ro?: number | null;
}

/** Corner frequencies → parts (exact inverses of §5.2, §5.3, §5.5 with R1 and Rb given). Throws if unbuildable. */
export function partsFromShape(shape: NetworkShape, inputs: SynthesisInputs): NetworkParts {
	const problem = shapeProblem(shape);
	if (problem) throw new RangeError(`cannot build ${shape.kind}: ${problem}`);
	const { r1, rb } = inputs;
	const omegaI = TWO_PI * shape.integratorHz;
	switch (shape.kind) {
		case 'type1':
			return { kind: 'type1', r1, rb, c1: 1 / (r1 * omegaI) };
		case 'type2': {
			const { c1, c2, r2 } = splitFeedback(1 / (r1 * omegaI), shape.zeroHz, shape.poleHz);
			return { kind: 'type2', r1, rb, r2, c1, c2 };
		}
		case 'type2-ota': {
			const gm = inputs.gm;
			if (!(gm !== undefined && gm > 0 && Number.isFinite(gm))) {
				throw new RangeError('cannot build type2-ota: parts.gm must be a transconductance > 0 S');
			}
			const h = dividerRatio(inputs);
			const { c1, c2, r2 } = splitFeedback((h * gm) / omegaI, shape.zeroHz, shape.poleHz);
			const parts: Type2OtaParts = { kind: 'type2-ota', r1, rb, gm, r2, c1, c2 };
			if (inputs.ro != null) parts.ro = inputs.ro;
			return parts;
		}
		case 'type3': {
			const { c1, c2, r2 } = splitFeedback(1 / (r1 * omegaI), shape.zero1Hz, shape.pole1Hz);
			const r3 = (r1 * shape.zero2Hz) / (shape.pole2Hz - shape.zero2Hz);
			const c3 = 1 / (TWO_PI * shape.pole2Hz * r3);
			return { kind: 'type3', r1, rb, r2, r3, c1, c2, c3 };
		}
	}
}

/** Csum = C1 + C2 split so the R2–C1 zero and the C2 pole land at zeroHz and poleHz (§5.2). */
function splitFeedback(csum: number, zeroHz: number, poleHz: number): { c1: number; c2: number; r2: number } {
	const c2 = (csum * zeroHz) / poleHz;
	const c1 = csum - c2;
	return { c1, c2, r2: 1 / (TWO_PI * zeroHz * c1) };
}

/**
 * |(1 + s/ωz…)/(1 + s/ωp…)| at fcHz: the part of |Gc| that is not the integrator.
 * The integrator needed for |Gc(j2πfc)| = gain is then ωI = gain·2π·fc/shapeMagnitude (§5.2 inverse).
 */
export function shapeMagnitude(zerosHz: readonly number[], polesHz: readonly number[], fcHz: number): number {
	let mag = 1;
	for (const z of zerosHz) mag *= Math.hypot(1, fcHz / z);
	for (const p of polesHz) mag /= Math.hypot(1, fcHz / p);
	return mag;
}

/** Finite zeros and poles of a shape (poles exclude the integrator at the origin). */
export function shapeCorners(shape: NetworkShape): { zerosHz: number[]; polesHz: number[] } {
	switch (shape.kind) {
		case 'type1':
			return { zerosHz: [], polesHz: [] };
		case 'type2':
		case 'type2-ota':
			return { zerosHz: [shape.zeroHz], polesHz: [shape.poleHz] };
		case 'type3':
			return { zerosHz: [shape.zero1Hz, shape.zero2Hz], polesHz: [shape.pole1Hz, shape.pole2Hz] };
	}
}

/** |Gc(j2πf)| of the ideal network (integrator included). */
export function shapeGainAt(shape: NetworkShape, freqHz: number): number {
	const { zerosHz, polesHz } = shapeCorners(shape);
	return (shape.integratorHz / freqHz) * shapeMagnitude(zerosHz, polesHz, freqHz);
}

/** The same shape with its integrator set so that |Gc(j2π·fcHz)| = gain. */
export function withGainAt(shape: NetworkShape, fcHz: number, gain: number): NetworkShape {
	const { zerosHz, polesHz } = shapeCorners(shape);
	return { ...shape, integratorHz: (gain * fcHz) / shapeMagnitude(zerosHz, polesHz, fcHz) };
}

/**
 * Mid-band gain as used for manual placement: the flat asymptote ωI/ωz (Type II, OTA) or ωI/ωz1 (Type III,
 * the R2/R1 level with the feedback zero "shorted"), §5.2/§5.3. Type I has none.
 */
export function midbandGain(shape: NetworkShape): number | null {
	if (shape.kind === 'type1') return null;
	const zero = shape.kind === 'type3' ? shape.zero1Hz : shape.zeroHz;
	return shape.integratorHz / zero;
}

/** The same shape with its integrator set for a given mid-band gain (see midbandGain). */
export function withMidbandGain(shape: NetworkShape, gain: number): NetworkShape {
	if (shape.kind === 'type1') throw new RangeError('a Type I integrator has no mid-band gain; give a crossover instead');
	const zero = shape.kind === 'type3' ? shape.zero1Hz : shape.zeroHz;
	return { ...shape, integratorHz: gain * zero };
}

/**
 * Pair free zeros and poles into a buildable Type III: sorted ascending, the lower zero/pole go to the feedback
 * branch (R2–C1, C2), the higher to the input branch (R3–C3). Sorted pairing is buildable whenever any pairing is.
 */
export function pairType3(zerosHz: readonly number[], polesHz: readonly number[]) {
	const z = [...zerosHz].sort((a, b) => a - b);
	const p = [...polesHz].sort((a, b) => a - b);
	return { zero1Hz: z[0], pole1Hz: p[0], zero2Hz: z[1], pole2Hz: p[1] };
}

/** Network parts as a flat record (kind dropped, optional ro/rb left out when absent) for reports. */
export function partsRecord(p: NetworkParts): Record<string, number> {
	const out: Record<string, number> = {};
	const record = p as unknown as Record<string, unknown>;
	for (const key in record) {
		const value = record[key];
		if (key !== 'kind' && typeof value === 'number') out[key] = value;
	}
	return out;
}

/** A frequency in the engine's messages: the project's one engineering-notation formatter. */
export function fmtHz(freqHz: number): string {
	return formatEng(freqHz, 'Hz', { missing: String(freqHz) });
}
