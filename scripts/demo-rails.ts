// The demo seed's boards and rails (an invented company): their stage data, tolerances and the
// design of each revision. Shared by scripts/seed.ts, the demo bench file (demo-bench.ts) and the
// browser test that walks through it.
import type { RailInput } from '../src/lib/schemas/workspace';
import type { LoopStatus } from '../src/lib/server/db/schema';

export type Design = Record<string, unknown>;

/** A design document (contract v1) whose network the engine places by the K-factor method. */
export function design(p: {
	topology: 'buck' | 'boost';
	vin: number;
	vout: number;
	iout: number;
	fsw: number;
	l: number;
	dcr: number;
	capacitors: { c: number; esr: number; count: number }[];
	vref: number;
	kind: 'type2' | 'type3';
	crossoverHz: number;
	phaseMarginDeg: number;
	vramp?: number;
	feedForward?: boolean;
}): Design {
	return {
		schemaVersion: 1,
		plant: {
			topology: p.topology,
			vin: p.vin,
			vout: p.vout,
			iout: p.iout,
			fsw: p.fsw,
			inductor: { l: p.l, dcr: p.dcr },
			capacitors: p.capacitors.map((c) => ({ ...c, esl: 0 })),
			rdsOn: 0.02
		},
		modulator: { vramp: p.vramp ?? 1, feedForward: p.feedForward ?? false, delay: 0 },
		feedback: { vref: p.vref, r1: 20_000 },
		compensator: {
			kind: p.kind,
			target: { method: 'k-factor', crossoverHz: p.crossoverHz, phaseMarginDeg: p.phaseMarginDeg },
			series: { resistors: 'E96', capacitors: 'E12' }
		}
	};
}

const TOL = { inductorPct: 20, capacitorPct: 20, esrPct: 50, vrefPct: 1 };

export interface RailSeed {
	rail: RailInput;
	/** Revisions in order, each with the status it ends in and an optional review note. */
	revisions: { design: Design; message: string; status: LoopStatus; note?: string }[];
}

export const gateway: RailSeed[] = [
	{
		rail: { name: '5V0_MAIN', topology: 'buck', vout: 5, vinNom: 24, vinMin: 18, vinMax: 32, ioutNom: 2.5, ioutMin: 0.25, ioutMax: 3.5, fsw: 400e3, tolerances: TOL, marginTargets: null, notes: 'From the 24 V field bus; feeds 3V3_IO and 1V0_CORE.' },
		revisions: [
			{
				design: design({ topology: 'buck', vin: 24, vout: 5, iout: 2.5, fsw: 400e3, l: 15e-6, dcr: 0.025, capacitors: [{ c: 47e-6, esr: 0.004, count: 2 }], vref: 0.8, kind: 'type3', crossoverHz: 35e3, phaseMarginDeg: 60, vramp: 2, feedForward: true }),
				message: 'Type III with input feed-forward, fc 35 kHz',
				status: 'approved',
				note: 'Margins hold across 18–32 V; approved for the EVT build.'
			}
		]
	},
	{
		rail: { name: '3V3_IO', topology: 'buck', vout: 3.3, vinNom: 5, vinMin: 4.75, vinMax: 5.25, ioutNom: 1.2, ioutMin: 0.1, ioutMax: 2, fsw: 1e6, tolerances: TOL, marginTargets: null, notes: null },
		revisions: [
			{
				design: design({ topology: 'buck', vin: 5, vout: 3.3, iout: 1.2, fsw: 1e6, l: 2.2e-6, dcr: 0.02, capacitors: [{ c: 22e-6, esr: 0.003, count: 2 }], vref: 0.6, kind: 'type3', crossoverHz: 80e3, phaseMarginDeg: 55 }),
				message: 'First cut, fc 80 kHz',
				status: 'approved'
			},
			{
				design: design({ topology: 'buck', vin: 5, vout: 3.3, iout: 1.2, fsw: 1e6, l: 2.2e-6, dcr: 0.02, capacitors: [{ c: 22e-6, esr: 0.003, count: 3 }], vref: 0.6, kind: 'type3', crossoverHz: 90e3, phaseMarginDeg: 55 }),
				message: 'Third output capacitor for the radio burst load; fc 90 kHz',
				status: 'draft'
			}
		]
	},
	{
		rail: {
			name: '1V0_CORE',
			topology: 'buck',
			vout: 1.0,
			vinNom: 5,
			vinMin: 4.75,
			vinMax: 5.25,
			ioutNom: 4,
			ioutMin: 0.5,
			ioutMax: 6,
			fsw: 800e3,
			tolerances: { inductorPct: 20, capacitorPct: 30, esrPct: 50, vrefPct: 0.5 },
			// The SoC's load steps need a fast loop; the team accepts a little less phase here.
			marginTargets: { phaseMarginDeg: 50, gainMarginDb: 8, maxCrossoverFraction: 0.1 },
			notes: 'SoC core; polymer bulk capacitor beside the ceramics.'
		},
		revisions: [
			{
				design: design({ topology: 'buck', vin: 5, vout: 1.0, iout: 4, fsw: 800e3, l: 0.68e-6, dcr: 0.004, capacitors: [{ c: 100e-6, esr: 0.002, count: 3 }, { c: 330e-6, esr: 0.012, count: 1 }], vref: 0.6, kind: 'type3', crossoverHz: 60e3, phaseMarginDeg: 60 }),
				message: 'Type III, fc 60 kHz, ceramics plus one polymer',
				status: 'in-review'
			}
		]
	}
];

export const sensorNode: RailSeed[] = [
	{
		rail: { name: '5V0_SENSOR', topology: 'boost', vout: 5, vinNom: 3.7, vinMin: 3.0, vinMax: 4.2, ioutNom: 0.3, ioutMin: 0.03, ioutMax: 0.45, fsw: 1e6, tolerances: TOL, marginTargets: null, notes: 'Li-ion cell to the sensor front end.' },
		revisions: [
			{
				design: design({ topology: 'boost', vin: 3.7, vout: 5, iout: 0.3, fsw: 1e6, l: 2.2e-6, dcr: 0.03, capacitors: [{ c: 22e-6, esr: 0.004, count: 2 }], vref: 0.8, kind: 'type3', crossoverHz: 35e3, phaseMarginDeg: 55 }),
				message: 'Type III well below the RHP zero',
				status: 'draft'
			}
		]
	},
	{
		rail: { name: '12V0_BIAS', topology: 'boost', vout: 12, vinNom: 3.7, vinMin: 3.0, vinMax: 4.2, ioutNom: 0.1, ioutMin: 0.02, ioutMax: 0.15, fsw: 600e3, tolerances: TOL, marginTargets: null, notes: 'Bias for the photodiode amplifier.' },
		revisions: [
			{
				design: design({ topology: 'boost', vin: 3.7, vout: 12, iout: 0.1, fsw: 600e3, l: 22e-6, dcr: 0.12, capacitors: [{ c: 10e-6, esr: 0.005, count: 2 }], vref: 1.0, kind: 'type2', crossoverHz: 6e3, phaseMarginDeg: 55 }),
				message: 'Type II, fc 6 kHz',
				status: 'changes-requested',
				note: 'A Type II cannot add enough phase near the double pole: PM is a few degrees. Try a Type III.'
			},
			{
				design: design({ topology: 'boost', vin: 3.7, vout: 12, iout: 0.1, fsw: 600e3, l: 22e-6, dcr: 0.12, capacitors: [{ c: 10e-6, esr: 0.005, count: 2 }], vref: 1.0, kind: 'type3', crossoverHz: 15e3, phaseMarginDeg: 55 }),
				message: 'Type III as asked in review, fc 15 kHz',
				status: 'draft'
			}
		]
	},
	{
		rail: { name: '1V8_MCU', topology: 'buck', vout: 1.8, vinNom: 3.7, vinMin: 3.0, vinMax: 4.2, ioutNom: 0.2, ioutMin: 0.01, ioutMax: 0.35, fsw: 2e6, tolerances: TOL, marginTargets: null, notes: null },
		revisions: [
			{
				design: design({ topology: 'buck', vin: 3.7, vout: 1.8, iout: 0.2, fsw: 2e6, l: 1e-6, dcr: 0.05, capacitors: [{ c: 22e-6, esr: 0.003, count: 1 }], vref: 0.6, kind: 'type3', crossoverHz: 100e3, phaseMarginDeg: 55 }),
				message: 'Type III, fc 100 kHz',
				status: 'approved'
			}
		]
	}
];
