// Each network's transfer function vs ngspice AC analysis of the op-amp/OTA circuit netlist
// (reference/compensators/generate.py → ngspice-ac.json). Tolerance 0.05 dB / 0.5° [project acceptance tolerance, reference/README.md].
// [published: ngspice AC small-signal analysis of the circuit, ideal op-amp as a 1e9 VCVS, finite op-amp as a
// single-pole macromodel]. When ngspice is on PATH the generator is re-run into a temp dir and diffed.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compensatorTf } from '../../../../src/lib/engine/compensators/transfer';
import type { NetworkParts } from '../../../../src/lib/engine/synthesis/networks';
import { evaluatePolar } from '../../../../src/lib/engine/tf';

interface RefCase {
	name: string;
	kind: NetworkParts['kind'];
	parts: Record<string, number>;
	opamp: { a0Db: number; gbw: number } | null;
	freqHz: number[];
	magDb: number[];
	phaseDeg: number[];
}
interface RefDoc {
	cases: RefCase[];
}

const REF_FILE = resolve(process.cwd(), 'reference/compensators/ngspice-ac.json');
const committed = JSON.parse(readFileSync(REF_FILE, 'utf8')) as RefDoc;

function toParts(c: RefCase): NetworkParts {
	return { kind: c.kind, ...c.parts } as unknown as NetworkParts;
}

/** Largest |ΔdB| and |Δdeg| of the engine's Gc against one reference case, with where they occur. */
export function deviation(c: RefCase) {
	const tf = compensatorTf(toParts(c), c.opamp);
	let worstDb = { value: 0, freqHz: 0, index: -1 };
	let worstDeg = { value: 0, freqHz: 0, index: -1 };
	c.freqHz.forEach((f, i) => {
		const { magDb, phaseDeg } = evaluatePolar(tf, 2 * Math.PI * f);
		const dDb = Math.abs(magDb - c.magDb[i]);
		const dDeg = Math.abs(phaseDeg - c.phaseDeg[i]);
		if (dDb > worstDb.value) worstDb = { value: dDb, freqHz: f, index: i };
		if (dDeg > worstDeg.value) worstDeg = { value: dDeg, freqHz: f, index: i };
	});
	return { worstDb, worstDeg };
}

describe('compensator transfer functions vs ngspice AC (committed reference)', () => {
	it('covers every network kind, ideal and finite op-amp', () => {
		const names = committed.cases.map((c) => c.name);
		for (const expected of ['type1-ideal', 'type1-finite', 'type2-ideal', 'type2-finite', 'type3-ideal', 'type3-finite', 'type2-ota-ideal', 'type2-ota-ro']) {
			expect(names).toContain(expected);
		}
	});

	it.each(committed.cases.map((c) => [c.name, c] as const))('%s within 0.05 dB / 0.5°', (_name, c) => {
		const { worstDb, worstDeg } = deviation(c);
		const where = `${c.name}: worst ${worstDb.value.toExponential(2)} dB at index ${worstDb.index} (${worstDb.freqHz} Hz), ` +
			`${worstDeg.value.toExponential(2)}° at index ${worstDeg.index} (${worstDeg.freqHz} Hz)`;
		expect(worstDb.value, where).toBeLessThan(0.05);
		expect(worstDeg.value, where).toBeLessThan(0.5);
	});

	it('the finite op-amp visibly differs from the ideal one (the model is not a no-op)', () => {
		// [published: ngspice] type3-finite-slow departs from type3-ideal by more than the tolerance
		const ideal = committed.cases.find((c) => c.name === 'type3-ideal')!;
		const slow = committed.cases.find((c) => c.name === 'type3-finite-slow')!;
		const gap = Math.max(...ideal.phaseDeg.map((p, i) => Math.abs(p - slow.phaseDeg[i])));
		expect(gap).toBeGreaterThan(5);
	});
});

const hasNgspice = spawnSync('ngspice', ['-v'], { encoding: 'utf8' }).status === 0;

describe.runIf(hasNgspice)('ngspice reference regenerates identically', () => {
	it('re-running reference/compensators/generate.py reproduces the committed JSON', () => {
		const dir = mkdtempSync(join(tmpdir(), 'lw-ngspice-'));
		try {
			const out = join(dir, 'ngspice-ac.json');
			execFileSync('python3', ['reference/compensators/generate.py', '--out', out], { stdio: 'pipe' });
			const fresh = JSON.parse(readFileSync(out, 'utf8')) as RefDoc;
			expect(fresh.cases.map((c) => c.name)).toEqual(committed.cases.map((c) => c.name));
			fresh.cases.forEach((c, k) => {
				const old = committed.cases[k];
				c.magDb.forEach((m, i) => expect(Math.abs(m - old.magDb[i]), `${c.name} magDb[${i}]`).toBeLessThan(1e-6));
				c.phaseDeg.forEach((p, i) => expect(Math.abs(p - old.phaseDeg[i]), `${c.name} phaseDeg[${i}]`).toBeLessThan(1e-6));
			});
		} finally {
			rmSync(dir, { recursive: true, force: true });
		}
	}, 60_000);
});
