/**
 * Command line: `npm run -s analyze -- design.json` (or `-` for stdin) prints the analysis
 * response JSON on stdout, exit 0. Invalid input (unreadable file, bad JSON, a design that breaks
 * a rule) prints the contract error JSON on stdout and exits 2. Options: --compact (one line).
 */
import { readFileSync } from 'node:fs';
import { analyzeDesign } from '../src/lib/engine/analyze';
import { contractError } from '../src/lib/engine/contract/errors';

function main(argv: string[]): number {
	const args = argv.filter((a) => !a.startsWith('--'));
	const compact = argv.includes('--compact');
	const print = (x: unknown) => process.stdout.write(JSON.stringify(x, null, compact ? undefined : 2) + '\n');
	if (argv.includes('--help') || args.length !== 1) {
		process.stderr.write('usage: npm run -s analyze -- <design.json | -> [--compact]\n');
		if (!argv.includes('--help')) print(contractError({ file: 'give exactly one design document path (or - for stdin)' }));
		return argv.includes('--help') ? 0 : 2;
	}
	const path = args[0];
	let text: string;
	try {
		text = readFileSync(path === '-' ? 0 : path, 'utf8');
	} catch (e) {
		print(contractError({ file: `cannot read ${path}: ${(e as NodeJS.ErrnoException).code ?? String(e)}` }));
		return 2;
	}
	let doc: unknown;
	try {
		doc = JSON.parse(text);
	} catch (e) {
		print(contractError({ file: `not valid JSON: ${(e as Error).message}` }));
		return 2;
	}
	const result = analyzeDesign(doc);
	print(result);
	return 'error' in result ? 2 : 0;
}

process.exitCode = main(process.argv.slice(2));
