import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

// The CLI contract (README.md, "The design document and the command-line analyser"): response JSON on stdout and exit 0; error JSON and exit 2 on bad input.
const run = (args: string[]) =>
	spawnSync(process.execPath, ['--import', 'tsx', 'scripts/analyze.ts', ...args], { encoding: 'utf8', timeout: 60_000 });

const design = {
	schemaVersion: 1,
	plant: {
		topology: 'boost',
		vin: 5,
		vout: 12,
		iout: 0.5,
		fsw: 500e3,
		inductor: { l: 10e-6, dcr: 0.03 },
		capacitors: [{ c: 22e-6, esr: 0.003, esl: 0, count: 2 }]
	},
	modulator: { vramp: 1 },
	feedback: { vref: 1.2, r1: 20000 },
	compensator: { kind: 'type3', target: { method: 'k-factor', crossoverHz: 5000, phaseMarginDeg: 55 } },
	sweep: { startHz: 10, stopHz: 250e3, points: 20 }
};

describe('scripts/analyze.ts', () => {
	const dir = mkdtempSync(path.join(tmpdir(), 'lw-cli-'));
	const file = (name: string, text: string) => {
		const p = path.join(dir, name);
		writeFileSync(p, text);
		return p;
	};

	it('prints the response and exits 0 for a valid design', () => {
		const r = run([file('ok.json', JSON.stringify(design))]);
		expect(r.status, r.stderr).toBe(0);
		const out = JSON.parse(r.stdout);
		expect(out.response.freqHz.length).toBe(20);
		expect(out.features.rhpZeroHz).toBeGreaterThan(0);
	}, 60_000);

	it('exits 2 with the error JSON for an invalid design, a missing file and bad JSON', () => {
		const bad = run([file('bad.json', JSON.stringify({ ...design, plant: { ...design.plant, vout: 3 } }))]);
		expect(bad.status).toBe(2);
		expect(JSON.parse(bad.stdout).error.fields['plant.vout']).toMatch(/> vin/);
		const missing = run([path.join(dir, 'nope.json')]);
		expect(missing.status).toBe(2);
		expect(JSON.parse(missing.stdout).error.code).toBe('invalid-design');
		const garbage = run([file('garbage.json', '{ not json')]);
		expect(garbage.status).toBe(2);
		expect(JSON.parse(garbage.stdout).error.fields.file).toMatch(/JSON/);
		rmSync(dir, { recursive: true, force: true });
	}, 120_000);
});

describe('scripts/analyze.ts --fit', () => {
	const dir = mkdtempSync(path.join(tmpdir(), 'lw-cli-fit-'));
	// reference/fit: a synthetic loop-gain measurement of known parameters and scipy's estimates.
	const ref = JSON.parse(readFileSync('reference/fit/out/cases.json', 'utf8'));
	const c = ref.cases[0];
	const designPath = path.join(dir, 'design.json');
	const benchPath = path.join(dir, 'bench.csv');
	writeFileSync(designPath, JSON.stringify(ref.design));
	writeFileSync(benchPath, ['Frequency (Hz),Gain (dB),Phase (deg)', ...c.measurement.freqHz.map((f: number, i: number) => `${f},${c.measurement.magDb[i]},${c.measurement.phaseDeg[i]}`)].join('\n'));

	it('fits the named parameters to an analyser file and prints the fit and the fitted document', () => {
		const r = run([designPath, '--fit', benchPath, '--params', 'c.0,c.1,esr.1,vramp,delay', '--compact']);
		expect(r.status, r.stdout + r.stderr).toBe(0);
		const out = JSON.parse(r.stdout);
		// Same estimates as scipy.optimize.least_squares on the same file (reference/fit/generate.py), to 1 % of the interval.
		c.scipy.estimates.forEach((e: { fitted: number; low: number; high: number }, k: number) => {
			expect(Math.abs(out.fit.parameters[k].fitted - e.fitted)).toBeLessThan(0.01 * (e.high - e.low));
		});
		expect(out.document.modulator.vramp).toBe(out.fit.parameters[3].fitted);
	}, 60_000);

	it('exits 2 with the field named for a bad parameter list or a missing file', () => {
		const bad = run([designPath, '--fit', benchPath, '--params', 'q']);
		expect(bad.status).toBe(2);
		expect(JSON.parse(bad.stdout).error.fields['parameters.0.name']).toMatch(/must be one of/);
		const missing = run([designPath, '--fit', path.join(dir, 'nope.csv'), '--params', 'l']);
		expect(missing.status).toBe(2);
		expect(JSON.parse(missing.stdout).error.fields.fit).toMatch(/cannot read/);
	}, 120_000);
});
