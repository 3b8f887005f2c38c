/**
 * Command line: `npm run -s analyze -- design.json` (or `-` for stdin) prints the analysis
 * response JSON on stdout, exit 0. Invalid input (unreadable file, bad JSON, a design that breaks
 * a rule) prints the contract error JSON on stdout and exits 2. Options: --compact (one line).
 *
 * `--fit bench.csv --params vramp,esr.0[,…]` instead fits those parameters of the design to the
 * measured file (docs/design-document.md §10): `--response loop|plant|output-impedance` (default
 * loop), `--vin`, `--iout` (the measurement's operating point), `--phase-reference inverted`.
 * Prints `{ fit, document }` (the document with the fitted values), or the error JSON and exit 2.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { analyzeDesign } from '../src/lib/engine/analyze';
import { contractError } from '../src/lib/engine/contract/errors';
import { designDocumentSchema } from '../src/lib/engine/contract/designSchema';
import { fitDesign, fitError, fittedDocument, FIT_RESPONSES, type FitResponse } from '../src/lib/engine/fit';
import { parseBenchFile } from '../src/lib/bench';

const USAGE = 'usage: npm run -s analyze -- <design.json | -> [--compact] [--fit bench.csv --params l,c.0,esr.1,vramp,delay [--response loop|plant|output-impedance] [--vin V] [--iout A]]\n';

function main(argv: string[]): number {
	let parsed;
	try {
		parsed = parseArgs({
			args: argv,
			allowPositionals: true,
			options: {
				compact: { type: 'boolean' },
				help: { type: 'boolean' },
				fit: { type: 'string' },
				params: { type: 'string' },
				response: { type: 'string' },
				vin: { type: 'string' },
				iout: { type: 'string' },
				'phase-reference': { type: 'string' }
			}
		});
	} catch (e) {
		process.stderr.write(USAGE);
		process.stdout.write(JSON.stringify(contractError({ arguments: (e as Error).message })) + '\n');
		return 2;
	}
	const { values: opt, positionals: args } = parsed;
	const print = (x: unknown) => process.stdout.write(JSON.stringify(x, null, opt.compact ? undefined : 2) + '\n');
	if (opt.help || args.length !== 1) {
		process.stderr.write(USAGE);
		if (!opt.help) print(contractError({ file: 'give exactly one design document path (or - for stdin)' }));
		return opt.help ? 0 : 2;
	}
	const path = args[0];
	const read = (p: string, field: string): string | { error: Record<string, string> } => {
		try {
			return readFileSync(p === '-' ? 0 : p, 'utf8');
		} catch (e) {
			return { error: { [field]: `cannot read ${p}: ${(e as NodeJS.ErrnoException).code ?? String(e)}` } };
		}
	};
	const text = read(path, 'file');
	if (typeof text !== 'string') {
		print(contractError(text.error));
		return 2;
	}
	let doc: unknown;
	try {
		doc = JSON.parse(text);
	} catch (e) {
		print(contractError({ file: `not valid JSON: ${(e as Error).message}` }));
		return 2;
	}
	if (opt.fit !== undefined) return fit(doc, opt, read, print);
	const result = analyzeDesign(doc);
	print(result);
	return 'error' in result ? 2 : 0;
}

/** --fit: the design's marked parameters fitted to a measured Bode file. */
function fit(
	doc: unknown,
	opt: { fit?: string; params?: string; response?: string; vin?: string; iout?: string; 'phase-reference'?: string },
	read: (p: string, field: string) => string | { error: Record<string, string> },
	print: (x: unknown) => void
): number {
	const fail = (fields: Record<string, string>) => (print(fitError(fields)), 2);
	const text = read(opt.fit!, 'fit');
	if (typeof text !== 'string') return fail(text.error);
	const phaseReference = opt['phase-reference'] === 'inverted' ? 'inverted' : 'loop-gain';
	const bench = parseBenchFile(text, { phaseReference });
	if (!bench.ok) {
		const e = bench.errors[0];
		return fail({ fit: `${e.line !== null ? `line ${e.line}: ` : ''}${e.message}` });
	}
	if (!opt.params) return fail({ params: 'name the uncertain parameters, e.g. --params vramp,esr.0' });
	const parameters = opt.params.split(',').map((s) => {
		const [name, branch] = s.trim().split('.');
		return branch === undefined ? { name } : { name, branch: Number(branch) };
	});
	const response = (opt.response ?? 'loop') as FitResponse;
	if (!FIT_RESPONSES.includes(response)) return fail({ response: `must be one of ${FIT_RESPONSES.join(', ')}` });
	const number = (x: string | undefined) => (x === undefined ? undefined : Number(x));
	const vin = number(opt.vin);
	const iout = number(opt.iout);
	if (vin !== undefined && !(vin > 0)) return fail({ vin: 'must be a number > 0 (V)' });
	if (iout !== undefined && !(iout > 0)) return fail({ iout: 'must be a number > 0 (A)' });
	const result = fitDesign({ document: doc, measurement: bench.data, request: { parameters, response }, measuredKind: response, vin, iout });
	if ('error' in result) {
		print(result);
		return 2;
	}
	print({ fit: result, document: fittedDocument(designDocumentSchema.parse(doc), result) });
	return 0;
}

process.exitCode = main(process.argv.slice(2));
