/**
 * Engineering-notation parser for typed values: `4.7u`, `4.7µ`, `4.7e-6`, `22m`, `1.2MEG`, `4k7`,
 * `2.2K`, `100n`, each with or without the field's unit (`4.7uF`, `22mΩ`, `450kHz`).
 * Case rule (see prefixes.ts): `m` milli, `M` mega, `MEG`/`meg` mega. The result is a finite
 * number or an error that names the rule broken; never NaN.
 */
import { formatEng } from './format';
import { AMBIGUOUS_PREFIX, PREFIX_EXPONENT, PREFIX_HELP } from './prefixes';
import { ALL_ALIASES, UNIT_ALIASES, type UnitSymbol } from './quantities';

export type ParseResult = { ok: true; value: number } | { ok: false; error: string };

export interface ParseOptions {
	/** The field's unit; a trailing copy of it is accepted and dropped. Default: none. */
	unit?: UnitSymbol;
}

const fail = (error: string): ParseResult => ({ ok: false, error });

// A decimal mantissa and an optional exponent. d3-format writes the minus as U+2212.
const NUMBER = /^([+\-\u2212]?)(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+\-\u2212]?\d+))?/;
// `4k7`, `1MEG5`, `4R7`: the prefix stands where the decimal point would be (R means ×1).
const INFIX = /^([+\-\u2212]?)(\d+)(MEG|meg|Meg|R|r|[fpnNuUµμmkKMGT])(\d+)$/;

const asciiMinus = (s: string) => s.replace(/\u2212/g, '-');

function prefixExponent(prefix: string): number | undefined {
	if (prefix === '') return 0;
	if (prefix.toUpperCase() === 'MEG') return PREFIX_EXPONENT.MEG;
	if (prefix === 'R' || prefix === 'r') return 0;
	return PREFIX_EXPONENT[prefix];
}

/** Removes a trailing spelling of the field's own unit; 's' and 'S' must match case exactly. */
function stripOwnUnit(text: string, unit: UnitSymbol | undefined): string {
	if (!unit) return text;
	const caseSensitive = unit === 's' || unit === 'S';
	for (const alias of [...UNIT_ALIASES[unit]].sort((a, b) => b.length - a.length)) {
		const tail = text.slice(-alias.length);
		// A tail right after the digits that matches only in another case and is itself a prefix is
		// the prefix: "4.7f" in a capacitance field is 4.7 fF (femto), not 4.7 F; "100pf" is 100 pF.
		const prefixInDisguise = tail !== alias && PREFIX_EXPONENT[tail] !== undefined && /[\d.]\s*$/.test(text.slice(0, -alias.length));
		const same = caseSensitive ? tail === alias : tail.toLowerCase() === alias.toLowerCase() && !prefixInDisguise;
		// Keep at least one character before the unit: "F" alone is not a value.
		if (same && text.length > alias.length) return text.slice(0, -alias.length).trimEnd();
	}
	return text;
}

/** A known unit other than the field's at the end of the text, matched exactly. */
function foreignUnit(text: string, unit: UnitSymbol | undefined): string | undefined {
	for (const { unit: other, alias } of ALL_ALIASES) {
		if (other === unit) continue;
		if (text.endsWith(alias) && text.length > alias.length) return other;
	}
	return undefined;
}

export function parseEng(input: string, options: ParseOptions = {}): ParseResult {
	const raw = input.trim();
	if (raw === '') return fail('enter a value');
	if (/^[+\-\u2212]?\d+,\d+/.test(raw)) return fail('use a point for decimals, like 4.7u');
	const text = stripOwnUnit(raw, options.unit);

	const infix = INFIX.exec(text);
	if (infix) {
		const [, sign, whole, prefix, fraction] = infix;
		const exponent = prefixExponent(prefix)!;
		return finish(Number(`${asciiMinus(sign)}${whole}.${fraction}e${exponent}`));
	}

	const number = NUMBER.exec(text);
	if (!number) return fail(`not a number: write digits with an optional prefix (${PREFIX_HELP}), like 4.7u or 4k7`);
	const [matched, sign, mantissa, exponentText] = number;
	const suffix = text.slice(matched.length).trim();

	if (suffix !== '' && exponentText !== undefined) return fail('use an exponent or a prefix, not both');
	let exponent = exponentText === undefined ? 0 : Number(asciiMinus(exponentText));
	if (suffix !== '') {
		if (AMBIGUOUS_PREFIX[suffix]) return fail(AMBIGUOUS_PREFIX[suffix]);
		const prefixPower = prefixExponent(suffix);
		if (prefixPower === undefined) {
			const other = foreignUnit(suffix, options.unit);
			if (other) return fail(options.unit ? `this field is in ${options.unit}, not ${other}` : `this field has no unit; drop ${other}`);
			return fail(`unknown prefix '${suffix}': use ${PREFIX_HELP}`);
		}
		exponent += prefixPower;
	}
	return finish(Number(`${asciiMinus(sign)}${mantissa}e${exponent}`));
}

function finish(value: number): ParseResult {
	if (!Number.isFinite(value)) return fail('too large: the value must be finite');
	// -0 reads as 0 everywhere downstream.
	return { ok: true, value: value === 0 ? 0 : value };
}

export interface QuantityRule extends ParseOptions {
	/** Require value > 0 (most physical parts). */
	positive?: boolean;
	/** Allow exactly 0 even when `positive` (e.g. ESL unknown = 0). */
	allowZero?: boolean;
	min?: number;
	max?: number;
	integer?: boolean;
}

/** Parses and checks a field's range; the error says which limit is broken. */
export function parseQuantity(input: string, rule: QuantityRule = {}): ParseResult {
	const parsed = parseEng(input, rule);
	if (!parsed.ok) return parsed;
	const v = parsed.value;
	if (rule.integer && !Number.isInteger(v)) return fail('must be a whole number');
	if (rule.positive && !(v > 0 || (rule.allowZero && v === 0))) return fail(rule.allowZero ? 'must be ≥ 0' : 'must be > 0');
	if (rule.min !== undefined && v < rule.min) return fail(`must be ≥ ${formatEng(rule.min, rule.unit)}`);
	if (rule.max !== undefined && v > rule.max) return fail(`must be ≤ ${formatEng(rule.max, rule.unit)}`);
	return parsed;
}
