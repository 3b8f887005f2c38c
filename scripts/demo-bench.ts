// The demo bench file: a loop-gain "measurement" of the demo rail 1V0_CORE in which one parasitic
// is deliberately off, so the fit on the rail screen has something to find. Invented data (demo
// only): the rail's own model with the polymer capacitor's ESR (branch 2) at 2.5 × its typed
// 12 mΩ, plus seeded analyser noise and two glitched points. The seed attaches the committed file
// to the rail; `npx tsx scripts/demo-bench.ts` writes it again from the model.
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { analyzeDesignDetailed, frequencyResponse, logGrid, type AnalysisDetail } from '../src/lib/engine';
import { buildLoop, loopSpecFromDetail } from '../src/lib/engine/corners/loopModel';
import { applyVariation } from '../src/lib/engine/corners/variation';
import { gateway } from './demo-rails';

export const DEMO_BENCH = {
	board: 'KF-210 Gateway main board',
	rail: '1V0_CORE',
	fileName: '1V0_CORE-loop-gain.csv',
	/** Where the file lives in the repository (relative to its root). */
	path: 'demo/1V0_CORE-loop-gain.csv',
	metadata: {
		kind: 'loop' as const,
		vin: 5,
		iout: 4,
		instrument: 'Bench analyser (demo data)',
		injectionPoint: 'Between Vout and the divider top resistor'
	},
	/** The part that is off in the "hardware": ESR of capacitor branch 2 (0-based 1), × 2.5. */
	fault: { name: 'esr' as const, branch: 1, factor: 2.5 }
};

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');

/** The demo rail's first revision, as the seed saves it. */
export function demoBenchDesign() {
	const seed = gateway.find((r) => r.rail.name === DEMO_BENCH.rail);
	if (!seed) throw new Error(`no demo rail ${DEMO_BENCH.rail}`);
	return seed.revisions[0].design;
}

/** Small seeded generator (mulberry32) and Box–Muller normals, so the file is the same on every run. */
function normals(seed: number) {
	let a = seed >>> 0;
	const uniform = () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
	return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

/** The CSV text of the demo measurement, from the model of `design` with the fault applied. */
export function demoBenchCsv(design: unknown = demoBenchDesign()): string {
	const detail = analyzeDesignDetailed(design) as AnalysisDetail;
	if ('error' in detail) throw new Error(`the demo design does not analyse: ${JSON.stringify(detail)}`);
	const spec = loopSpecFromDetail(detail);
	const esr = spec.stage.capacitors.map((_, i) => (i === DEMO_BENCH.fault.branch ? DEMO_BENCH.fault.factor : 1));
	const hardware = applyVariation(spec, { vin: DEMO_BENCH.metadata.vin, iout: DEMO_BENCH.metadata.iout, branchFactors: { esr } });
	const f = logGrid(100, 300e3, 161);
	const r = frequencyResponse(buildLoop(hardware).loop, f);
	const noise = normals(20261203);
	// An analyser's trace noise (0.05 dB, 0.3°) and two points hit by a range switch.
	const glitch = new Map([[57, [1.8, -9]], [118, [-1.5, 7]]]);
	const lines = [
		'# Loopwright demo data (invented): loop gain of 1V0_CORE at Vin 5 V, Iout 4 A',
		'# made from the rail model with one parasitic off; see README "Walk-through: fit a bench measurement"',
		'Frequency (Hz),Gain (dB),Phase (deg)'
	];
	f.forEach((hz, i) => {
		const [dDb, dDeg] = glitch.get(i) ?? [0, 0];
		const db = r.magDb[i] + 0.05 * noise() + dDb;
		const deg = r.phaseDeg[i] + 0.3 * noise() + dDeg;
		lines.push(`${hz.toPrecision(6)},${db.toFixed(3)},${deg.toFixed(2)}`);
	});
	return lines.join('\n') + '\n';
}

/** The committed file's text. */
export const demoBenchText = () => readFileSync(join(ROOT, DEMO_BENCH.path), 'utf8');

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
	writeFileSync(join(ROOT, DEMO_BENCH.path), demoBenchCsv());
	console.log(`wrote ${DEMO_BENCH.path}`);
}
