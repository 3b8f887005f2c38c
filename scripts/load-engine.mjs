// The engine's own time for the load test's reference: runs analyzeDesign from the *built* server
// chunk (the very code `node build` runs) in a fresh Node process with nothing else on its heap.
// Usage: node scripts/load-engine.mjs <build dir> <rounds> < design.json
// Prints one JSON line: mean and median ms per analysis (JIT warmed), and JSON.stringify's time
// for the response (reported beside the ratio; sending the answer is the API's work, not the engine's).
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const [buildDir, roundsArg] = process.argv.slice(2);
const rounds = Number(roundsArg || 300);
const chunks = join(resolve(buildDir), 'server', 'chunks');

/** The chunk that defines analyzeDesign, and the name it is exported under (Rollup shortens it). */
function findEngine() {
	const files = readdirSync(chunks, { recursive: true }).map(String).filter((f) => /\.js$/.test(f));
	for (const file of files) {
		const text = readFileSync(join(chunks, file), 'utf8');
		const alias = /export\s*{[^}]*\banalyzeDesign as (\w+)/.exec(text)?.[1] ?? (/export\s*{[^}]*\banalyzeDesign\b[,\s}]/.test(text) ? 'analyzeDesign' : null);
		if (alias) return { file: join(chunks, file), alias };
	}
	throw new Error(`no built chunk exports analyzeDesign under ${chunks}`);
}

const design = JSON.parse(readFileSync(0, 'utf8'));
const { file, alias } = findEngine();
const analyzeDesign = (await import(pathToFileURL(file).href))[alias];
if (typeof analyzeDesign !== 'function') throw new Error(`${file} exports no function ${alias}`);

for (let i = 0; i < 100; i++) analyzeDesign(design);
const times = [];
const start = process.hrtime.bigint();
let response;
for (let i = 0; i < rounds; i++) {
	const t = process.hrtime.bigint();
	response = analyzeDesign(design);
	times.push(Number(process.hrtime.bigint() - t) / 1e6);
}
const totalMs = Number(process.hrtime.bigint() - start) / 1e6;
times.sort((a, b) => a - b);
if ('error' in response) throw new Error(`the load design does not analyse: ${JSON.stringify(response).slice(0, 300)}`);
const s = process.hrtime.bigint();
let bytes = 0;
for (let i = 0; i < 50; i++) bytes = JSON.stringify(response).length;
const stringifyMs = Number(process.hrtime.bigint() - s) / 1e6 / 50;
console.log(JSON.stringify({ rounds, meanMs: totalMs / rounds, medianMs: times[rounds >> 1], stringifyMs, responseBytes: bytes, chunk: file.slice(chunks.length + 1) }));
