// Property tests of the whole analysis on random valid designs: no exception, no NaN or
// Infinity anywhere in the response, and the refined margins agree with a brute-force dense
// sweep of T(jω) done here in plain complex arithmetic (not the engine's log-sum evaluation).
// The dense-sweep method is the textbook one [common practice: docs/formulas.md §7.5 — bracket the
// sign changes on a dense log grid]; phase crossings are found where T crosses the negative
// real axis, which needs no phase unwrapping at all.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeDesign, analyzeDesignDetailed } from '$lib/engine/analyze';
import { analysisResponseSchema } from '$lib/engine/contract/responseSchema';
import type { FactoredTf, Root } from '$lib/engine/tf/types';
import { breakage, breakDocument, namesPath, validDesign } from './designs';
import { propertyParams, propertyTimeout } from './runs';

/** Every number in a JSON-like value, with its path, that is not finite. */
function nonFinite(value: unknown, path = ''): string[] {
	if (typeof value === 'number') return Number.isFinite(value) ? [] : [`${path} = ${value}`];
	if (Array.isArray(value)) return value.flatMap((v, i) => nonFinite(v, `${path}[${i}]`));
	if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => nonFinite(v, path ? `${path}.${k}` : k));
	return [];
}

/** T(jω) as a complex number, multiplying the factors one by one. */
function loopAt(tf: FactoredTf, omega: number): { re: number; im: number } {
	let re = tf.gain;
	let im = 0;
	const mul = (a: number, b: number) => {
		const r = re * a - im * b;
		im = re * b + im * a;
		re = r;
	};
	const div = (a: number, b: number) => {
		const d = a * a + b * b;
		mul(a / d, -b / d);
	};
	const factor = (r: Root): [number, number] =>
		r.kind === 'real' ? [1, omega / r.omega] : [1 - (omega / r.omega0) ** 2, Number.isFinite(r.q) ? omega / (r.q * r.omega0) : 0];
	// (jω)^n: rotate by n·90° and scale by ω^n.
	const n = tf.originPower;
	for (let k = 0; k < Math.abs(n); k++) (n > 0 ? mul : div)(0, omega);
	for (const z of tf.zeros) mul(...factor(z));
	for (const p of tf.poles) div(...factor(p));
	const td = tf.delayS ?? 0;
	if (td) mul(Math.cos(omega * td), -Math.sin(omega * td));
	return { re, im };
}

/** Phase agreement asked of a refined crossing: the root finder stops on a frequency interval, so
 * the phase there can differ by ~1e-4° (seen: 1.00000000026e-4° at 2 MHz); 1e-3° is still a
 * hundred times finer than the 0.1° margins are reported to [common practice]. */
const PHASE_TOL_DEG = 1e-3;

const abs = (z: { re: number; im: number }) => Math.hypot(z.re, z.im);

/** How much ∠T moves across a relative frequency window of ±1e-10 (wider than the root finder's last
 * interval): beside an undamped pair (a capacitor with ESL and no ESR) the phase is that steep, and a
 * refined crossing cannot be pinned finer than this. */
function phaseSpreadDeg(tf: FactoredTf, freqHz: number): number {
	const a = loopAt(tf, 2 * Math.PI * freqHz * (1 - 1e-10));
	const b = loopAt(tf, 2 * Math.PI * freqHz * (1 + 1e-10));
	return (Math.abs(Math.atan2(a.re * b.im - a.im * b.re, a.re * b.re + a.im * b.im)) * 180) / Math.PI;
}
/** The same for 20·log10|T|: a crossing a hair above an undamped notch sits where |T| climbs from
 * −∞ dB, and the root finder's last interval spans a measurable slice of a dB there. */
function magSpreadDb(tf: FactoredTf, freqHz: number): number {
	const a = abs(loopAt(tf, 2 * Math.PI * freqHz * (1 - 1e-10)));
	const b = abs(loopAt(tf, 2 * Math.PI * freqHz * (1 + 1e-10)));
	return Math.abs(20 * Math.log10(b / a));
}
const reduceDeg = (x: number) => {
	let y = x - 360 * Math.floor((x + 180) / 360);
	if (y <= -180) y += 360;
	return y;
};
const degDiff = (a: number, b: number) => Math.abs(reduceDeg(a - b));

interface Bracket {
	loHz: number;
	hiHz: number;
}

/**
 * Dense log sweep (pointsPerDecade) over the range: brackets of |T| = 1 and of T crossing the
 * negative real axis. A step over which T turns by more than 30° (a sharp resonance), or the
 * delay alone by more than 15°, is halved until it does not, so no crossing hides between samples.
 */
function denseSweep(tf: FactoredTf, startHz: number, stopHz: number, pointsPerDecade: number) {
	const decades = Math.log10(stopHz / startHz);
	const n = Math.max(2, Math.ceil(decades * pointsPerDecade) + 1);
	const gain: Bracket[] = [];
	const phase: Bracket[] = [];
	const td = tf.delayS ?? 0;
	const at = (f: number) => ({ f, t: loopAt(tf, 2 * Math.PI * f) });
	const turn = (a: { re: number; im: number }, b: { re: number; im: number }) => Math.abs(Math.atan2(a.re * b.im - a.im * b.re, a.re * b.re + a.im * b.im));
	const step = (a: ReturnType<typeof at>, b: ReturnType<typeof at>, depth: number) => {
		// The delay alone turns T by 360°·Δf·Td, which the angle between two samples cannot see past 180°.
		if (depth < 24 && (turn(a.t, b.t) > Math.PI / 6 || 360 * (b.f - a.f) * td > 15)) {
			const mid = at(Math.sqrt(a.f * b.f));
			step(a, mid, depth + 1);
			step(mid, b, depth + 1);
			return;
		}
		if (abs(a.t) >= 1 !== abs(b.t) >= 1) gain.push({ loHz: a.f, hiHz: b.f });
		// Im changes sign while Re < 0 on both ends: T crossed the negative real axis.
		if (a.t.re < 0 && b.t.re < 0 && a.t.im >= 0 !== b.t.im >= 0) phase.push({ loHz: a.f, hiHz: b.f });
	};
	let prev = at(startHz);
	for (let i = 1; i < n; i++) {
		const cur = at(startHz * 10 ** ((decades * i) / (n - 1)));
		step(prev, cur, 0);
		prev = cur;
	}
	return { gain, phase };
}

const inside = (f: number, b: Bracket) => f >= b.loHz * (1 - 1e-9) && f <= b.hiHz * (1 + 1e-9);

describe('analysis of random valid designs', () => {
	it('never throws, never fails unexpectedly, and reports only finite numbers', () => {
		fc.assert(
			fc.property(validDesign, (doc) => {
				const r = analyzeDesign(doc);
				if ('error' in r) {
					// Refusing an operating point or an unbuildable compensator is fine; an internal failure is a bug.
					expect(r.error.code, JSON.stringify(r.error)).not.toBe('analysis-failed');
					expect(Object.keys(r.error.fields).length).toBeGreaterThan(0);
					return;
				}
				expect(nonFinite(r)).toEqual([]);
				const schema = analysisResponseSchema.safeParse(r);
				expect(schema.success, schema.success ? '' : JSON.stringify(schema.error.issues.slice(0, 3))).toBe(true);
				expect(r.response.loop.magDb.length).toBe(r.response.freqHz.length);
			}),
			propertyParams(150)
		);
	}, propertyTimeout());

	it('refined crossings sit where a dense sweep brackets them, with |T| = 1 and ∠T = −180° exactly there', () => {
		let analysed = 0;
		fc.assert(
			fc.property(validDesign, (doc) => {
				const d = analyzeDesignDetailed(doc, { includeResponse: false });
				if ('error' in d) return;
				analysed++;
				const m = d.metrics;
				const { startHz, stopHz } = d.response.metrics.analysedRangeHz;
				const sweep = denseSweep(d.loop, startHz, stopHz, 400);

				// Every crossing the engine reports is a true crossing, checked by the independent evaluation.
				for (const x of m.crossovers) {
					const t = loopAt(d.loop, 2 * Math.PI * x.freqHz);
					expect(Math.abs(20 * Math.log10(abs(t))), `|T| at ${x.freqHz} Hz`).toBeLessThan(1e-4 + magSpreadDb(d.loop, x.freqHz));
					expect(degDiff(x.phaseMarginDeg, 180 + (Math.atan2(t.im, t.re) * 180) / Math.PI), `PM at ${x.freqHz} Hz`).toBeLessThan(PHASE_TOL_DEG + phaseSpreadDeg(d.loop, x.freqHz));
				}
				for (const x of m.phaseCrossovers) {
					const t = loopAt(d.loop, 2 * Math.PI * x.freqHz);
					expect(degDiff((Math.atan2(t.im, t.re) * 180) / Math.PI, 180), `∠T at ${x.freqHz} Hz`).toBeLessThan(PHASE_TOL_DEG + phaseSpreadDeg(d.loop, x.freqHz));
					expect(Math.abs(x.gainMarginDb + 20 * Math.log10(abs(t))), `GM at ${x.freqHz} Hz`).toBeLessThan(1e-6 * Math.max(1, Math.abs(x.gainMarginDb)) + magSpreadDb(d.loop, x.freqHz));
				}
				// Every crossing the dense sweep sees has its refined counterpart in that bracket.
				for (const b of sweep.gain) {
					expect(m.crossovers.some((x) => inside(x.freqHz, b)), `gain crossing in [${b.loHz}, ${b.hiHz}] Hz missing`).toBe(true);
				}
				// Except across an undamped zero pair's ω0 (a capacitor with ESL and no ESR): there T runs
				// through the origin on a line, |T| = 0, and the sweep's sign test sees a "crossing" that is
				// no crossing of the negative real axis (the gain margin would be infinite) [hand-derivable].
				const notchesHz = d.loop.zeros.filter((z) => z.kind === 'pair' && !Number.isFinite(z.q)).map((z) => (z as { omega0: number }).omega0 / (2 * Math.PI));
				for (const b of sweep.phase) {
					if (notchesHz.some((f0) => inside(f0, b))) continue;
					expect(m.phaseCrossovers.some((x) => inside(x.freqHz, b)), `phase crossing in [${b.loHz}, ${b.hiHz}] Hz missing`).toBe(true);
				}
				// The governing figures follow the contract's rule over the listed crossings: smallest |PM|,
				// smallest |GM dB| (python-control's stability_margins convention [from memory]).
				if (m.crossovers.length === 0) expect(m.phaseMarginDeg).toBeNull();
				else expect(Math.abs(m.phaseMarginDeg!)).toBe(Math.min(...m.crossovers.map((x) => Math.abs(x.phaseMarginDeg))));
				if (m.phaseCrossovers.length === 0) expect(m.gainMarginDb).toBeNull();
				else expect(Math.abs(m.gainMarginDb!)).toBe(Math.min(...m.phaseCrossovers.map((x) => Math.abs(x.gainMarginDb))));
			}),
			propertyParams(300)
		);
		// Most random designs must get analysed, or the property above proves little.
		expect(analysed).toBeGreaterThan(0);
	}, propertyTimeout());
});

describe('random invalid documents', () => {
	it('always give field errors on the broken path, never a response or an exception', () => {
		fc.assert(
			fc.property(validDesign, breakage, (doc, b) => {
				const r = analyzeDesign(breakDocument(doc, b));
				expect('error' in r, `${b.path} = ${JSON.stringify(b.value)} was accepted`).toBe(true);
				if (!('error' in r)) return;
				expect(r.error.code).toBe('invalid-design');
				expect(namesPath(r.error.fields, b.path), `${b.path} = ${JSON.stringify(b.value)} → ${JSON.stringify(r.error.fields)}`).toBe(true);
			}),
			propertyParams(300)
		);
	}, propertyTimeout());

	it('any JSON value that is not a design gets an error object, not a throw', () => {
		fc.assert(
			fc.property(fc.jsonValue(), (value) => {
				const r = analyzeDesign(value);
				expect('error' in r).toBe(true);
				if ('error' in r) expect(Object.keys(r.error.fields).length).toBeGreaterThan(0);
			}),
			propertyParams(200)
		);
	}, propertyTimeout());
});
