// Fuzzing of the two text parsers users feed by hand. The bench-file parser: analyzer-style
// files with a preamble, comments, blank lines, any column order, units and line endings read
// back exactly, and one corrupted cell is reported on its physical line and column. The
// engineering-notation parser: every way of writing a value (4.7u, 4.7µF, 4k7, 1MEG, 2.2e-6)
// reads as the number the notation means [common practice: SI prefixes, SPICE's MEG and
// infix 4k7 forms], and arbitrary text never crashes it.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseBenchFile } from '$lib/bench';
import { parseEng, type UnitSymbol } from '$lib/units';
import { propertyParams, propertyTimeout } from './runs';

const SEPARATORS = [',', ';', '\t'] as const;
const EOLS = ['\n', '\r\n', '\r'] as const;
const PREAMBLE = fc.constantFrom('Instrument: bench analyzer', '# injection at R1', '! swept sine', '', 'Date 2026-01-01', '% level 20 mV');

/** A plain decimal or exponent form of x, as analyzers write numbers. */
const written = (x: number, style: number) => (style === 0 ? String(x) : style === 1 ? x.toExponential(12) : x.toPrecision(15));

const benchFile = fc
	.record({
		separator: fc.constantFrom(...SEPARATORS),
		eol: fc.constantFrom(...EOLS),
		bom: fc.boolean(),
		preamble: fc.array(PREAMBLE, { maxLength: 5 }),
		order: fc.constantFrom([0, 1, 2], [0, 2, 1], [1, 0, 2], [2, 1, 0], [1, 2, 0], [2, 0, 1]),
		extraColumn: fc.boolean(),
		freqUnit: fc.constantFrom(['Hz', 1], ['kHz', 1e3], ['MHz', 1e6]) as fc.Arbitrary<[string, number]>,
		phaseUnit: fc.constantFrom(['deg', 1], ['rad', Math.PI / 180]) as fc.Arbitrary<[string, number]>,
		startHz: fc.double({ min: 1, max: 1e3, noNaN: true }),
		stepRatio: fc.double({ min: 1.001, max: 1.5, noNaN: true }),
		gains: fc.array(fc.double({ min: -80, max: 80, noNaN: true }), { minLength: 2, maxLength: 60 }),
		phaseSteps: fc.array(fc.double({ min: -20, max: 20, noNaN: true }), { minLength: 60, maxLength: 60 }),
		style: fc.integer({ min: 0, max: 2 }),
		// Lines between data rows: none, blank, or a comment (index = after which row).
		interludes: fc.array(fc.tuple(fc.nat(60), fc.constantFrom('', '# retry', '// note')), { maxLength: 4 })
	})
	.map((f) => {
		const n = f.gains.length;
		const freqHz = Array.from({ length: n }, (_, i) => f.startHz * f.stepRatio ** i);
		let phase = -90;
		const phaseDeg = f.gains.map((_, i) => (phase += f.phaseSteps[i]));
		const names = [`Frequency (${f.freqUnit[0]})`, 'Gain (dB)', `Phase (${f.phaseUnit[0]})`];
		const header = f.order.map((k) => names[k]);
		if (f.extraColumn) header.push('Status');
		const lines: string[] = [...f.preamble, header.join(f.separator)];
		const rowLine: number[] = [];
		for (let i = 0; i < n; i++) {
			const values = [freqHz[i] / f.freqUnit[1], f.gains[i], phaseDeg[i] * f.phaseUnit[1]];
			const cells = f.order.map((k) => written(values[k], f.style));
			if (f.extraColumn) cells.push('OK');
			lines.push(cells.join(f.separator));
			rowLine.push(lines.length); // 1-based physical line of this row
			for (const [after, text] of f.interludes) if (after === i) lines.push(text);
		}
		return { text: (f.bom ? '\uFEFF' : '') + lines.join(f.eol), freqHz, gainDb: f.gains, phaseDeg, rowLine, order: f.order, separator: f.separator };
	});

const close = (a: number, b: number, rel = 1e-9) => Math.abs(a - b) <= rel * Math.max(1, Math.abs(b));

describe('bench-file parser', () => {
	it('reads analyzer-style files back exactly, whatever the layout', () => {
		fc.assert(
			fc.property(benchFile, (f) => {
				const r = parseBenchFile(f.text);
				expect(r.ok, r.ok ? '' : JSON.stringify(r.errors)).toBe(true);
				if (!r.ok) return;
				expect(r.data.freqHz.length).toBe(f.freqHz.length);
				for (let i = 0; i < f.freqHz.length; i++) {
					expect(close(r.data.freqHz[i], f.freqHz[i]), `f[${i}]`).toBe(true);
					expect(close(r.data.magDb[i], f.gainDb[i]), `gain[${i}]`).toBe(true);
					// Steps of at most 20° never wrap, so unwrapping must leave the phase as written.
					expect(close(r.data.phaseDeg[i], f.phaseDeg[i]), `phase[${i}]`).toBe(true);
				}
			}),
			propertyParams(200)
		);
	}, propertyTimeout());

	it('reports a corrupted cell on its physical line and column', () => {
		const junk = fc.constantFrom('x', '1..2', '--3', '4,5,', 'NaN', 'inf', '1e', '0x10', '12 dB');
		fc.assert(
			fc.property(benchFile, fc.nat(), fc.integer({ min: 0, max: 2 }), junk, (f, pick, column, bad) => {
				const row = pick % f.freqHz.length;
				const lines = f.text.split(/\r\n|\n|\r/);
				const lineIndex = f.rowLine[row] - 1;
				const cells = lines[lineIndex].split(f.separator);
				// A junk value holding the separator would add cells; keep it out of this property.
				if (bad.includes(f.separator)) return;
				cells[column] = bad;
				lines[lineIndex] = cells.join(f.separator);
				const r = parseBenchFile(lines.join('\n'));
				expect(r.ok).toBe(false);
				if (r.ok) return;
				expect(r.errors.some((e) => e.line === f.rowLine[row] && e.column === column + 1), JSON.stringify(r.errors)).toBe(true);
			}),
			propertyParams(200)
		);
	}, propertyTimeout());

	it('never throws on mangled files, and places every error inside the file', () => {
		const edit = fc.record({ at: fc.nat(), cut: fc.nat(20), insert: fc.string({ maxLength: 8 }) });
		fc.assert(
			fc.property(benchFile, fc.array(edit, { maxLength: 6 }), (f, edits) => {
				let text = f.text;
				for (const e of edits) {
					const at = e.at % (text.length + 1);
					text = text.slice(0, at) + e.insert + text.slice(at + e.cut);
				}
				const r = parseBenchFile(text);
				if (r.ok) {
					for (let i = 1; i < r.data.freqHz.length; i++) expect(r.data.freqHz[i]).toBeGreaterThan(r.data.freqHz[i - 1]);
					for (const x of [...r.data.freqHz, ...r.data.magDb, ...r.data.phaseDeg]) expect(Number.isFinite(x)).toBe(true);
				} else {
					const lineCount = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/).length;
					for (const e of r.errors) if (e.line !== null) expect(e.line >= 1 && e.line <= lineCount, `line ${e.line} of ${lineCount}`).toBe(true);
				}
			}),
			propertyParams(200)
		);
	}, propertyTimeout());
});

/** Prefix spellings and their powers of ten (case rule of the units module: m milli, M and MEG mega). */
const PREFIXES: [string, number][] = [
	['f', -15],
	['p', -12],
	['n', -9],
	['u', -6],
	['µ', -6],
	['m', -3],
	['', 0],
	['k', 3],
	['K', 3],
	['M', 6],
	['MEG', 6],
	['meg', 6],
	['G', 9],
	['T', 12]
];
const UNIT_SPELLING: [UnitSymbol, string][] = [
	['F', 'F'],
	['H', 'H'],
	['Ω', 'Ω'],
	['Ω', 'ohm'],
	['Hz', 'Hz'],
	['V', 'V'],
	['A', 'A']
];

describe('engineering-notation parser', () => {
	it('reads every notation of a value as the number it means', () => {
		const notation = fc.record({
			whole: fc.integer({ min: 0, max: 999 }),
			fraction: fc.integer({ min: 0, max: 9999 }),
			prefix: fc.constantFrom(...PREFIXES),
			unit: fc.constantFrom(...UNIT_SPELLING),
			form: fc.constantFrom('point', 'infix', 'exponent'),
			withUnit: fc.boolean(),
			space: fc.constantFrom('', ' '),
			negative: fc.boolean()
		});
		fc.assert(
			fc.property(notation, (n) => {
				const digits = `${n.whole}.${n.fraction}`;
				const expected = Number(`${n.negative ? '-' : ''}${digits}e${n.prefix[1]}`);
				const sign = n.negative ? '-' : '';
				let text: string;
				if (n.form === 'exponent') text = `${sign}${digits}e${n.prefix[1]}`;
				else if (n.form === 'infix' && n.prefix[0] !== '') text = `${sign}${n.whole}${n.prefix[0]}${n.fraction}`;
				else text = `${sign}${digits}${n.space}${n.prefix[0]}`;
				if (n.withUnit) text += (n.form === 'infix' ? '' : n.space) + n.unit[1];
				// An infix value followed by a unit ("4k7F") is not a written form we promise to read.
				if (n.form === 'infix' && n.withUnit && n.prefix[0] !== '') return;
				const r = parseEng(text, { unit: n.unit[0] });
				expect(r.ok, `${text}: ${r.ok ? '' : r.error}`).toBe(true);
				if (r.ok) expect(close(r.value, expected, 1e-12), `${text} → ${r.value}, expected ${expected}`).toBe(true);
			}),
			propertyParams(500)
		);
	}, propertyTimeout());

	it('fixed: "4.7f" in a farad field is 4.7 fF, not 4.7 F (found by the notation property)', () => {
		// [common practice: f is the SI prefix femto; SPICE reads 4.7f the same way]
		const r = parseEng('4.7f', { unit: 'F' });
		expect(r.ok && close(r.value, 4.7e-15, 1e-12)).toBe(true);
		const pf = parseEng('100pf', { unit: 'F' });
		expect(pf.ok && close(pf.value, 100e-12, 1e-12)).toBe(true);
	});

	it('refuses a foreign unit', () => {
		fc.assert(
			fc.property(fc.double({ min: 1e-3, max: 1e3, noNaN: true }), fc.constantFrom(...UNIT_SPELLING), fc.constantFrom(...UNIT_SPELLING), (x, field, typed) => {
				if (field[0] === typed[0]) return;
				const r = parseEng(`${x.toPrecision(3)}${typed[1]}`, { unit: field[0] });
				expect(r.ok).toBe(false);
			}),
			propertyParams(200)
		);
	}, propertyTimeout());

	it('never throws or returns a non-finite number on arbitrary text', () => {
		fc.assert(
			fc.property(fc.string({ maxLength: 30 }), fc.constantFrom<UnitSymbol>('', 'F', 'Ω', 'Hz', 's'), (text, unit) => {
				const r = parseEng(text, { unit });
				if (r.ok) expect(Number.isFinite(r.value)).toBe(true);
				else expect(r.error.length).toBeGreaterThan(0);
			}),
			propertyParams(500)
		);
	}, propertyTimeout());
});
