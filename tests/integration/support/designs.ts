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
