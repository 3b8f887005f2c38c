// The example document of the contract (spec: design-document.md), a fresh copy per call: a
// 5 V → 1.2 V buck at 600 kHz with a Type III network given by parts.
export function contractExample() {
	return {
		schemaVersion: 1,
		plant: {
			topology: 'buck',
			vin: 5,
			vout: 1.2,
			iout: 8,
			fsw: 600000,
			inductor: { l: 1.0e-6, dcr: 0.004 },
			capacitors: [{ c: 47e-6, esr: 0.002, esl: 0, count: 3 }],
			rdsOn: 0.006
		},
		modulator: { vramp: 1.0, feedForward: false, delay: 0 },
		feedback: { vref: 0.6, r1: 10000 },
		compensator: {
			kind: 'type3',
			parts: { r2: 2000, r3: 150, c1: 6.8e-9, c2: 220e-12, c3: 2.2e-9 },
			target: { method: 'k-factor', crossoverHz: 60000, phaseMarginDeg: 55 },
			series: { resistors: 'E96', capacitors: 'E12' }
		},
		sweep: { startHz: 10, stopHz: 1000000, points: 401 }
	};
}
