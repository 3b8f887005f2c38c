/**
 * Loads the committed outside references (reference/cases, reference/scipy/out,
 * reference/ngspice/out) and measures the worst deviation of an engine response from them.
 * Test support only: reads files, never imported by the engine.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { PowerStageInput } from '$lib/engine';

export const REFERENCE_DIR = fileURLToPath(new URL('../../../reference', import.meta.url));

export interface Bode {
	magDb: number[];
	phaseDeg: number[];
}

export interface ReferenceOutput {
	case: string;
	versions: Record<string, string>;
	freqHz: number[];
	responses: Record<string, Bode>;
	operatingPoint: { duty: number; efficiency: number; vout: number; inductorCurrent?: number };
	metrics?: {
		crossoverHz: number | null;
		phaseMarginDeg: number | null;
		gainMarginDb: number | null;
		crossovers: { freqHz: number; phaseMarginDeg: number }[];
		phaseCrossovers: { freqHz: number; gainMarginDb: number }[];
		closedLoopStable: boolean | null;
	} | null;
}

// The design documents are contract v1 JSON; typed loosely here so a contract extension does not
// break the loader.
export type DesignDoc = Record<string, any>;

export const caseNames = (): string[] =>
	readdirSync(path.join(REFERENCE_DIR, 'cases'))
		.filter((f) => f.endsWith('.json'))
		.map((f) => f.slice(0, -5))
		.sort();

const readJson = <T>(...parts: string[]): T => JSON.parse(readFileSync(path.join(REFERENCE_DIR, ...parts), 'utf8')) as T;

export const loadCase = (name: string): DesignDoc => readJson<DesignDoc>('cases', `${name}.json`);
export const loadOutput = (tool: 'scipy' | 'ngspice', name: string, dir?: string): ReferenceOutput =>
	dir ? (JSON.parse(readFileSync(path.join(dir, `${name}.json`), 'utf8')) as ReferenceOutput) : readJson<ReferenceOutput>(tool, 'out', `${name}.json`);

export interface Deviation {
	magDb: { value: number; index: number; freqHz: number; engine: number; reference: number };
	phaseDeg: { value: number; index: number; freqHz: number; engine: number; reference: number };
}

/** Worst |engine − reference| in dB and in degrees over the points with freqHz ≤ maxFreqHz. */
export function worstDeviation(freqHz: ArrayLike<number>, reference: Bode, engine: { magDb: ArrayLike<number>; phaseDeg: ArrayLike<number> }, maxFreqHz = Infinity): Deviation {
	const worst: Deviation = {
		magDb: { value: -1, index: -1, freqHz: NaN, engine: NaN, reference: NaN },
		phaseDeg: { value: -1, index: -1, freqHz: NaN, engine: NaN, reference: NaN }
	};
	for (let i = 0; i < freqHz.length; i++) {
		if (freqHz[i] > maxFreqHz) continue;
		for (const key of ['magDb', 'phaseDeg'] as const) {
			const e = engine[key][i];
			const r = reference[key][i];
			// NaN in the engine output must fail, so it counts as an infinite deviation.
			const d = Number.isFinite(e) ? Math.abs(e - r) : Infinity;
			if (d > worst[key].value) worst[key] = { value: d, index: i, freqHz: freqHz[i], engine: e, reference: r };
		}
	}
	return worst;
}

export const describeDeviation = (label: string, d: Deviation['magDb'], unit: string): string =>
	`${label}: worst at index ${d.index}, ${d.freqHz.toPrecision(6)} Hz: engine ${d.engine} ${unit}, reference ${d.reference} ${unit} (|Δ| = ${d.value.toExponential(3)} ${unit})`;

/** The plant part of a design document in the engine's power-stage input shape. */
export function stageInput(doc: DesignDoc): PowerStageInput {
	const p = doc.plant;
	return {
		topology: p.topology,
		vin: p.vin,
		vout: p.vout,
		iout: p.iout,
		fswHz: p.fsw,
		l: p.inductor.l,
		dcr: p.inductor.dcr ?? 0,
		rdsOn: p.rdsOn ?? 0,
		capacitors: p.capacitors.map((c: DesignDoc) => ({ c: c.c, esr: c.esr ?? 0, esl: c.esl ?? 0, count: c.count ?? 1 }))
	};
}
