/**
 * One variant of a loop: another input voltage or load, and multipliers on part values.
 * Part names follow the design document (plant: l, dcr, rdsOn, c, esr, esl; compensator: r1,
 * r2, r3, c1, c2, c3, gm, ro; modulator: vramp in voltage mode, senseGain Ri and rampSlope Se in
 * peak current mode). `c`, `esr`, `esl` scale every capacitor
 * branch, or each branch separately through `branchFactors`. Rb stays as built: a tolerance
 * on R1 moves Gc; the output voltage is taken as nominal (the small-signal model's point).
 */
import type { NetworkParts } from '../synthesis/networks';
import type { LoopSpec } from './loopModel';
import { dcrAt, rdsOnAt, REFERENCE_TEMPERATURE_C, temperatureClass } from '../plants/derating';

export const PLANT_PARTS = ['l', 'dcr', 'rdsOn', 'c', 'esr', 'esl'] as const;
export const COMPENSATOR_PARTS = ['r1', 'r2', 'r3', 'c1', 'c2', 'c3', 'gm', 'ro'] as const;
export const MODULATOR_PARTS = ['vramp', 'senseGain', 'rampSlope'] as const;
export const PART_NAMES = [...PLANT_PARTS, ...COMPENSATOR_PARTS, ...MODULATOR_PARTS] as const;
export type PartName = (typeof PART_NAMES)[number];

/** How each part is named to people (corner labels, tolerance tables). */
export const PART_LABELS: Record<PartName, string> = {
	l: 'L',
	dcr: 'DCR',
	rdsOn: 'RDS(on)',
	c: 'C',
	esr: 'ESR',
	esl: 'ESL',
	r1: 'R1',
	r2: 'R2',
	r3: 'R3',
	c1: 'C1',
	c2: 'C2',
	c3: 'C3',
	gm: 'gm',
	ro: 'Ro',
	vramp: 'Ramp Vpp',
	senseGain: 'Ri',
	rampSlope: 'Se'
};

/**
 * What a modulator part's short name stands for, where a person choosing it may not know the
 * symbol (the fit's choices): "Ri (sense gain)".
 */
export const PART_MEANINGS: Partial<Record<PartName, string>> = { vramp: 'modulator gain', senseGain: 'sense gain', rampSlope: 'ramp slope' };

/**
 * How a part, or the loop delay that the fit and the sensitivities vary beside the parts, is named
 * to people; one capacitor branch of a bank of several is numbered: "C (branch 2)".
 */
export function partLabel(name: PartName | 'delay', branch: number | null = null, branches = 1): string {
	const base = name === 'delay' ? 'Loop delay' : PART_LABELS[name];
	return branch !== null && branches > 1 ? `${base} (branch ${branch + 1})` : base;
}

export interface Variation {
	vin?: number;
	iout?: number;
	/** Multiplier per part (1 = nominal). */
	factors?: Partial<Record<PartName, number>>;
	/** Part temperature, °C (absent = 25 °C): capacitor class, DCR (copper) and RDS(on) follow it. */
	temperatureC?: number;
	/** Per-branch multipliers for c, esr, esl (index = capacitor branch), applied after `factors`. */
	branchFactors?: { c?: readonly number[]; esr?: readonly number[]; esl?: readonly number[] };
}

/** Parts a spec actually has (a Type II has no r3; an ideal OTA no ro; dcr = 0 has nothing to vary). */
export function partsPresent(spec: LoopSpec): PartName[] {
	const cm = spec.modulator.currentMode;
	// The modulator's parts by control method: the ramp in voltage mode; Ri and (when there is one) Se in peak current mode.
	const out: PartName[] = ['l', 'c', ...(cm ? (['senseGain', ...(cm.rampSlope > 0 ? ['rampSlope' as const] : [])] as const) : (['vramp'] as const))];
	if (spec.stage.dcr > 0) out.push('dcr');
	if (spec.stage.rdsOn > 0) out.push('rdsOn');
	if (spec.stage.capacitors.some((b) => b.esr > 0)) out.push('esr');
	if (spec.stage.capacitors.some((b) => b.esl > 0)) out.push('esl');
	const p = spec.parts as unknown as Record<string, unknown>;
	for (const name of COMPENSATOR_PARTS) if (typeof p[name] === 'number' && (p[name] as number) > 0) out.push(name);
	return out;
}

export function applyVariation(spec: LoopSpec, v: Variation): LoopSpec {
	const f = (name: PartName) => v.factors?.[name] ?? 1;
	const bf = v.branchFactors ?? {};
	const s = spec.stage;
	const t = v.temperatureC ?? REFERENCE_TEMPERATURE_C;
	const th = spec.thermal;
	const classOf = (i: number) => (th?.tempClasses[i] ? temperatureClass(th.tempClasses[i]!) : null);
	const thermalC = (i: number) => (t === REFERENCE_TEMPERATURE_C ? 1 : (classOf(i)?.factorAt(t) ?? 1));
	const capacitors = s.capacitors.map((b, i) => ({
		c: b.c * f('c') * (bf.c?.[i] ?? 1) * thermalC(i),
		esr: b.esr * f('esr') * (bf.esr?.[i] ?? 1),
		esl: b.esl * f('esl') * (bf.esl?.[i] ?? 1),
		count: b.count
	}));
	const parts = { ...spec.parts } as Record<string, unknown>;
	for (const name of COMPENSATOR_PARTS) {
		const value = parts[name];
		if (typeof value === 'number') parts[name] = value * f(name);
	}
	return {
		...spec,
		stage: {
			...s,
			vin: v.vin ?? s.vin,
			iout: v.iout ?? s.iout,
			l: s.l * f('l'),
			dcr: dcrAt(s.dcr, t) * f('dcr'),
			rdsOn: rdsOnAt(s.rdsOn, th?.rdsOnTempco, t) * f('rdsOn'),
			capacitors
		},
		modulator: {
			...spec.modulator,
			vramp: spec.modulator.vramp * f('vramp'),
			...(spec.modulator.currentMode
				? { currentMode: { senseGain: spec.modulator.currentMode.senseGain * f('senseGain'), rampSlope: spec.modulator.currentMode.rampSlope * f('rampSlope') } }
				: {})
		},
		parts: parts as unknown as NetworkParts
	};
}
