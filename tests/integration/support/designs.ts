// Design documents (contract v1) for the integration tests: an invented 12 V → 5 V buck at
// 500 kHz whose Type III network the engine places by the K-factor method, so no part values
// are hand-picked. It matches railBody() in fixtures.ts.
export function buckDesign(overrides: { feedForward?: boolean; crossoverHz?: number } = {}) {
	return {
		schemaVersion: 1,
		plant: {
			topology: 'buck',
			vin: 12,
			vout: 5,
			iout: 2,
			fsw: 500_000,
			inductor: { l: 10e-6, dcr: 0.015 },
			capacitors: [{ c: 22e-6, esr: 0.003, esl: 0, count: 3 }],
			rdsOn: 0.01
		},
		modulator: { vramp: 1.5, feedForward: overrides.feedForward ?? false, delay: 0 },
		feedback: { vref: 0.8, r1: 10_000 },
		compensator: {
			kind: 'type3',
			target: { method: 'k-factor', crossoverHz: overrides.crossoverHz ?? 40_000, phaseMarginDeg: 60 },
			series: { resistors: 'E96', capacitors: 'E12' }
		}
	};
}

/**
 * The costliest document the contract accepts (README.md, "Limits"): buckDesign() with every
 * field that scales the work at its ceiling (contract/designSchema.ts, corners/schema.ts,
 * closedloop/sections.ts): the longest delay (4 switching periods), the widest and densest sweep
 * (5000 points to 10 × fsw), 2¹² = 4096 exhaustive tolerance corners (12 toleranced parts, one
 * operating point), the largest spread run inline (2000 samples, 400 bins), eight capacitor
 * branches with ESL, a finite op-amp, a load step and an input filter.
 */
export function worstCaseDesign() {
	const base = buckDesign();
	const fsw = base.plant.fsw;
	const parts = ['l', 'dcr', 'rdsOn', 'c', 'esr', 'esl', 'r1', 'r2', 'r3', 'c1', 'c2', 'c3'];
	return {
		...base,
		plant: {
			...base.plant,
			capacitors: Array.from({ length: 8 }, (_, i) => ({ c: 22e-6 / (i + 1), esr: 0.003 * (i + 1), esl: 3e-10 * (i + 1), count: 1 }))
		},
		modulator: { ...base.modulator, delay: 4 / fsw },
		compensator: { ...base.compensator, opamp: { a0Db: 100, gbw: 10e6 } },
		sweep: { startHz: 1, stopHz: 10 * fsw, points: 5000 },
		loadStep: { step: 1, riseTime: 1e-6, duration: 10 },
		tolerances: Object.fromEntries(parts.map((p) => [p, { tol: 0.2, dist: 'normal', sigmas: 3 }])),
		corners: { maxCorners: 4096 },
		spread: { samples: 2000, seed: 7, bins: 400 },
		inputFilter: { l: 1e-6, dcr: 0.01, c: 10e-6, damping: { optimalRatio: 4 } }
	};
}

/**
 * buckDesign()'s stage under peak current-mode control: Ri = 0.1 V/A, Se = 35 kV/s (mc ≈ 1.5 at
 * D ≈ 0.42), a Type II placed by K-factor at 30 kHz (Type II is the usual network there).
 */
export function currentModeBuckDesign() {
	const base = buckDesign();
	return {
		...base,
		modulator: { control: 'peak-current', senseGain: 0.1, rampSlope: 35e3, delay: 0 },
		compensator: { kind: 'type2', target: { method: 'k-factor', crossoverHz: 30_000, phaseMarginDeg: 60 }, series: { resistors: 'E96', capacitors: 'E12' } }
	};
}

/**
 * A 12 V → 24 V, 1 A boost at 500 kHz under peak current mode (Ri = 0.05 V/A, Se = 50 kV/s, above
 * the (Sf − Sn)/2 a 9 V input needs), crossed at 5 kHz, below its RHP zero near 95 kHz.
 */
export function currentModeBoostDesign() {
	return {
		schemaVersion: 1,
		plant: {
			topology: 'boost',
			vin: 12,
			vout: 24,
			iout: 1,
			fsw: 500_000,
			inductor: { l: 10e-6, dcr: 0.02 },
			capacitors: [{ c: 22e-6, esr: 0.003, esl: 0, count: 3 }],
			rdsOn: 0.015
		},
		modulator: { control: 'peak-current', senseGain: 0.05, rampSlope: 50e3, delay: 0 },
		feedback: { vref: 0.8, r1: 10_000 },
		compensator: { kind: 'type2', target: { method: 'k-factor', crossoverHz: 5_000, phaseMarginDeg: 60 }, series: { resistors: 'E96', capacitors: 'E12' } }
	};
}
