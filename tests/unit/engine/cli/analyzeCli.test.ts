import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
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
